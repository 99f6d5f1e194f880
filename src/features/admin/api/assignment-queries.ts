import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { assignmentListSchema } from "@shared/schemas/assignment";
import { api } from "@/lib/api-client";

export const assignmentQueries = {
  root: () => ["regulator-assignments"] as const,
  all: () =>
    queryOptions({
      queryKey: [...assignmentQueries.root(), "list"] as const,
      queryFn: () => api.get("/api/regulator-assignments", assignmentListSchema),
    }),
};

export function useAddAssignment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { userId: number; entityCode: string }) => api.post("/api/regulator-assignments", body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: assignmentQueries.root() }),
  });
}

export function useRemoveAssignment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, entityCode }: { userId: number; entityCode: string }) =>
      api.del(`/api/regulator-assignments/${userId}/${encodeURIComponent(entityCode)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: assignmentQueries.root() }),
  });
}
