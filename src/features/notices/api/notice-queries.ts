import { useMutation, useQueryClient } from "@tanstack/react-query";
import { noticeListSchema, noticeSchema, type Notice } from "@shared/schemas/notice";
import { api } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

/**
 * Every key of the overshooting notices; they start with "notices", so the shared "every figure" rule
 * (lib/query-scope: all but "auth") reads them again after an upload commit opened new ones.
 */
export const noticeKeys = {
  all: () => ["notices"] as const,
  list: (entity: string) => [...noticeKeys.all(), "list", entity] as const,
};

export const noticeQueries = {
  /** The entity's notices, newest overshooting first (GET /api/notices?entity=…). */
  list: (entity: string) =>
    getQuery(noticeKeys.list(entity), `/api/notices?entity=${encodeURIComponent(entity)}`, noticeListSchema),
};

/** Puts the notice the server answered into the entity's list, then reads the list and the queue again. */
function useSettle(entity: string) {
  const queryClient = useQueryClient();
  return (notice: Notice) => {
    queryClient.setQueryData(noticeKeys.list(entity), (list: Notice[] | undefined) =>
      list?.map((n) => (n.id === notice.id ? notice : n)),
    );
    return Promise.all([
      queryClient.invalidateQueries({ queryKey: noticeKeys.list(entity) }),
      queryClient.invalidateQueries({ queryKey: ["queue"] }),
    ]);
  };
}

/** The analyst saves the cause so far, with the version they saw (409 stale when someone saved first). */
export function useDraftNotice(entity: string, id: number) {
  const settle = useSettle(entity);
  return useMutation({
    mutationFn: (body: { cause: string; version: number }) => api.put(`/api/notices/${id}/draft`, body, noticeSchema),
    onSuccess: settle,
  });
}

/** The chief risk officer sends the drafted notice to the supervisor contacts. */
export function useSendNotice(entity: string, id: number) {
  const settle = useSettle(entity);
  return useMutation({
    mutationFn: (body: { version: number }) => api.post(`/api/notices/${id}/send`, body, noticeSchema),
    onSuccess: settle,
  });
}
