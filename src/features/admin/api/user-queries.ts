import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { userListSchema, userSchema, type CreateUserBody, type UpdateUserBody } from "@shared/schemas/admin";
import { api } from "@/lib/api-client";
import { assignmentQueries } from "./assignment-queries";

export const userQueries = {
  root: () => ["users"] as const,
  all: () => queryOptions({ queryKey: [...userQueries.root(), "list"] as const, queryFn: () => api.get("/api/users", userListSchema) }),
};

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateUserBody) => api.post("/api/users", body, userSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userQueries.root() }),
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
  });
}

export function useResetPassword() {
  return useMutation({
    mutationFn: ({ id, password }: { id: number; password: string }) => api.post(`/api/users/${id}/password`, { password }),
  });
}
