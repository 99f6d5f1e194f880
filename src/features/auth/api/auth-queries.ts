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
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: [...authQueries.all(), "accept-invitation"],
    mutationFn: (body: AcceptInvitationBody) => api.post("/api/invitations/accept", body, meResponseSchema),
    onSuccess: ({ user }) => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authQueries.all()[0] });
      queryClient.setQueryData(authQueries.me().queryKey, user);
    },
  });
}
