import { useMutation, useQueryClient, type QueryClient } from "@tanstack/react-query";
import { z } from "zod";
import {
  createUserResultSchema,
  pendingInvitationListSchema,
  roleRequestListSchema,
  roleRequestSchema,
  userListSchema,
  userSchema,
  type CreateUserBody,
  type PasswordLinkBody,
  type ProposeRoleBody,
  type UpdateUserBody,
  type User,
} from "@shared/schemas/user";
import { api, staleCurrent } from "@/lib/api-client";
import { getQuery, useRefreshingMutation } from "@/lib/queries";
import { assignmentQueries } from "./assignment-queries";

export const userQueries = {
  root: () => ["users"] as const,
  all: () => getQuery([...userQueries.root(), "list"], "/api/users", userListSchema),
  /** Set-password links not used yet (open or expired). */
  invitations: () => getQuery([...userQueries.root(), "invitations"], "/api/invitations", pendingInvitationListSchema),
  /** Grants and removals of the CRO or administrator role waiting for a second administrator. */
  roleRequests: () => getQuery([...userQueries.root(), "role-requests"], "/api/role-requests", roleRequestListSchema),
};

/** The user as it now stands, from a 409 `stale` refusal (`details.current`): someone else changed them first. */
export function currentUserOfStale(error: unknown): User | undefined {
  return staleCurrent(error, userSchema);
}

/** What a stale refusal tells the admin, in plain words; undefined for any other error. */
export function staleUserMessage(error: unknown): string | undefined {
  const current = currentUserOfStale(error);
  if (!current) return undefined;
  return `Someone else changed ${current.name} while you had this page open, so your change was not saved. The list now shows them as they are; make your change again if it is still needed.`;
}

/** After a stale refusal: show the user as the server has them at once, then read the whole list again. */
function showCurrentState(queryClient: QueryClient, error: unknown) {
  const current = currentUserOfStale(error);
  if (!current) return;
  queryClient.setQueryData(userQueries.all().queryKey, (list) => list?.map((u) => (u.id === current.id ? current : u)));
  return queryClient.invalidateQueries({ queryKey: userQueries.root() });
}

export function useCreateUser() {
  return useRefreshingMutation((body: CreateUserBody) => api.post("/api/users", body, createUserResultSchema), {
    queryKey: userQueries.root(),
  });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: UpdateUserBody }) => api.patch(`/api/users/${id}`, body, userSchema),
    // A renamed or re-roled user also changes how assignments read.
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: userQueries.root() }),
        queryClient.invalidateQueries({ queryKey: assignmentQueries.root() }),
      ]),
    onError: (error) => showCurrentState(queryClient, error),
  });
}

const passwordLinkResultSchema = z.object({
  user: userSchema,
  invitation: z.object({ purpose: z.enum(["invite", "reset"]), expiresAt: z.string() }),
});

/** Sends a user a new one-time link to set their password (their invitation again, or a reset). */
export function useSendPasswordLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: PasswordLinkBody }) =>
      api.post(`/api/users/${id}/password-link`, body, passwordLinkResultSchema),
    // Sending moves the user's version: the next edit must send the new one.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userQueries.root() }),
    onError: (error) => showCurrentState(queryClient, error),
  });
}

/** Unlocks an account locked out by failed sign-ins; the person may try again at once. */
export function useUnlockUser() {
  return useRefreshingMutation((id: number) => api.post(`/api/users/${id}/unlock`, {}, userSchema), {
    queryKey: userQueries.root(),
  });
}

export function useProposeRole() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ProposeRoleBody) => api.post("/api/role-requests", body, roleRequestSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userQueries.root() }),
    onError: (error) => showCurrentState(queryClient, error),
  });
}

/** Approves or rejects a role request; either way the users, links and requests are read again. */
export function useDecideRoleRequest() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, decision }: { id: number; decision: "approve" | "reject" }) =>
      api.post(`/api/role-requests/${id}/${decision}`, undefined, roleRequestSchema),
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: userQueries.root() }),
        queryClient.invalidateQueries({ queryKey: assignmentQueries.root() }),
      ]),
  });
}
