import { useMutation, useQueryClient } from "@tanstack/react-query";
import { queueSchema } from "@shared/schemas/queue";
import { settingsListSchema, settingsRecordSchema } from "@shared/schemas/determination";
import { api } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";
import { getQuery } from "@/lib/queries";

export const queueQueries = {
  root: () => ["queue"] as const,
  /** What waits for the signed-in person, across every entity and quarter (GET /api/queue). */
  list: () =>
    // The count in the navigation follows what others do too (a quarter submitted elsewhere).
    getQuery([...queueQueries.root(), "list"], "/api/queue", queueSchema, {
      staleTime: 15_000,
      refetchInterval: 60_000,
    }),
  /** An entity's dated settings records: a proposal is decided with its values in view. */
  settings: (entity: string) =>
    getQuery(
      [...queueQueries.root(), "settings", entity],
      `/api/entities/${encodeURIComponent(entity)}/settings`,
      settingsListSchema,
    ),
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
