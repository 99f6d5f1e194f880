import { useMutation, useQueryClient } from "@tanstack/react-query";
import { settingsListSchema, settingsRecordSchema, type ProposeSettingsBody } from "@shared/schemas/determination";
import { api } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";
import { getQuery, useRefreshingMutation } from "@/lib/queries";

const entityBase = (code: string) => `/api/entities/${encodeURIComponent(code)}/settings`;

/** Every key of the supervisory settings screen; they all start with "settings". */
export const settingsKeys = {
  all: () => ["settings"] as const,
  list: (entity: string) => [...settingsKeys.all(), entity] as const,
};

export const settingsQueries = {
  /** The entity's dated records, newest effective date first (proposed, approved and rejected). */
  list: (entity: string) => getQuery(settingsKeys.list(entity), entityBase(entity), settingsListSchema),
};

/** An admin proposes a change; nothing moves until a CRO approves it, so only the list is read again. */
export function useProposeSettings(entity: string) {
  return useRefreshingMutation(
    (body: ProposeSettingsBody) => api.post(entityBase(entity), body, settingsRecordSchema),
    { queryKey: settingsKeys.list(entity) },
  );
}

/**
 * A CRO approves or rejects a proposal. An approval moves the multiplier from its effective date
 * on, so every figure on every screen goes stale; a rejection changes only the list.
 */
export function useDecideSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, decision, comment }: { id: number; decision: "approve" | "reject"; comment?: string }) =>
      api.post(`/api/settings/${id}/${decision}`, comment ? { comment } : {}, settingsRecordSchema),
    onSuccess: (_record, { decision }) =>
      queryClient.invalidateQueries(decision === "approve" ? everyFigure : { queryKey: settingsKeys.all() }),
  });
}
