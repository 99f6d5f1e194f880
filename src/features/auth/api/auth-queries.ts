import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { meResponseSchema, sessionResponseSchema, type LoginBody, type SessionUser } from "@shared/schemas/auth";
import { api } from "@/lib/api-client";

export const authQueries = {
  all: () => ["auth"] as const,
  /** The signed-in user, or `null` when the session cookie is missing or no longer valid. */
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all(), "me"] as const,
      queryFn: async (): Promise<SessionUser | null> => {
        const { user } = await api.get("/api/auth/session", sessionResponseSchema);
        return user;
      },
      // Changes only through sign-in and sign-out, which write it themselves.
      staleTime: Infinity,
    }),
};

export function useLogin() {
  const queryClient = useQueryClient();
  return useMutation({
    // Keyed under "auth" so a 401 here reads as "wrong credentials", not as "session ended".
    mutationKey: [...authQueries.all(), "login"],
    mutationFn: (body: LoginBody) => api.post("/api/auth/login", body, meResponseSchema),
    onSuccess: ({ user }) => {
      // Nothing cached for a previous user may survive into this session.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authQueries.all()[0] });
      queryClient.setQueryData(authQueries.me().queryKey, user);
    },
  });
}

export function useLogout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: [...authQueries.all(), "logout"],
    mutationFn: () => api.post("/api/auth/logout"),
    onSuccess: () => {
      queryClient.clear();
      queryClient.setQueryData(authQueries.me().queryKey, null);
    },
  });
}
