import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { queueSchema } from "@shared/schemas/queue";
import { settingsListSchema, settingsRecordSchema } from "@shared/schemas/determination";
import { api } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";

export const queueQueries = {
  root: () => ["queue"] as const,
  /** What waits for the signed-in person, across every entity and quarter (GET /api/queue). */
  list: () =>
    queryOptions({
      queryKey: [...queueQueries.root(), "list"] as const,
      queryFn: () => api.get("/api/queue", queueSchema),
      // The count in the navigation follows what others do too (a quarter submitted elsewhere).
      staleTime: 15_000,
      refetchInterval: 60_000,
    }),
  /** An entity's dated settings records: a proposal is decided with its values in view. */
  settings: (entity: string) =>
    queryOptions({
      queryKey: [...queueQueries.root(), "settings", entity] as const,
      queryFn: () => api.get(`/api/entities/${encodeURIComponent(entity)}/settings`, settingsListSchema),
    }),
};

/** The CRO approves or rejects a proposed settings record; every figure may move with an approval. */
export function useDecideSettings(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (v: { decision: "approve" | "reject"; comment?: string }) =>
      api.post(
        `/api/settings/${id}/${v.decision}`,
        v.comment === undefined ? {} : { comment: v.comment },
        settingsRecordSchema,
      ),
    onSettled: () => queryClient.invalidateQueries(everyFigure),
  });
}
