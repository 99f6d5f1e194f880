import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import {
  invitationSchema,
  meResponseSchema,
  sessionResponseSchema,
  type AcceptInvitationBody,
  type ChangePasswordBody,
  type LoginBody,
  type SessionUser,
} from "@shared/schemas/auth";
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

/**
 * A call whose answer signs someone in: nothing cached for a previous user survives into their
 * session, and the answer's user becomes the signed-in one. Keyed under "auth" so a 401 here reads
 * as "wrong credentials", not as "session ended".
 */
function useSigningIn<B>(name: string, mutationFn: (body: B) => Promise<{ user: SessionUser }>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: [...authQueries.all(), name],
    mutationFn,
    onSuccess: ({ user }) => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authQueries.all()[0] });
      queryClient.setQueryData(authQueries.me().queryKey, user);
    },
  });
}

export function useLogin() {
  return useSigningIn("login", (body: LoginBody) => api.post("/api/auth/login", body, meResponseSchema));
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

/** Changes one's own password; the server ends every other session and sends this one a new cookie. */
export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: [...authQueries.all(), "password"],
    mutationFn: (body: ChangePasswordBody) => api.post("/api/auth/password", body, meResponseSchema),
    onSuccess: ({ user }) => queryClient.setQueryData(authQueries.me().queryKey, user),
  });
}

/** What a set-password link is for (public: the invitee has no session yet). */
export const invitationQueries = {
  one: (token: string) =>
    queryOptions({
      queryKey: [...authQueries.all(), "invitation", token] as const,
      queryFn: () => api.post("/api/invitations/lookup", { token }, invitationSchema),
      retry: false,
      staleTime: Infinity,
    }),
};

/** Sets the password from the link; the server signs the person in. */
export function useAcceptInvitation() {
  return useSigningIn("accept-invitation", (body: AcceptInvitationBody) =>
    api.post("/api/invitations/accept", body, meResponseSchema),
  );
}
