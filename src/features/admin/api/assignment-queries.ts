import { assignmentListSchema } from "@shared/schemas/assignment";
import { api } from "@/lib/api-client";
import { getQuery, useRefreshingMutation } from "@/lib/queries";

export const assignmentQueries = {
  root: () => ["regulator-assignments"] as const,
  all: () => getQuery([...assignmentQueries.root(), "list"], "/api/regulator-assignments", assignmentListSchema),
};

export function useAddAssignment() {
  return useRefreshingMutation(
    (body: { userId: number; entityCode: string }) => api.post("/api/regulator-assignments", body),
    { queryKey: assignmentQueries.root() },
  );
}

export function useRemoveAssignment() {
  return useRefreshingMutation(
    ({ userId, entityCode }: { userId: number; entityCode: string }) =>
      api.del(`/api/regulator-assignments/${userId}/${encodeURIComponent(entityCode)}`),
    { queryKey: assignmentQueries.root() },
  );
}
