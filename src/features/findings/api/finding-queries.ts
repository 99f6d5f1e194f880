import { keepPreviousData, useMutation, useQueryClient } from "@tanstack/react-query";
import { findingListSchema, findingSchema, type CloseFindingBody, type Finding } from "@shared/schemas/finding";
import { api, withQuery } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

export type FindingStatus = Finding["status"];
export type FindingFilters = { entity?: string; status?: FindingStatus };

export const findingQueries = {
  root: () => ["findings"] as const,
  list: ({ entity, status }: FindingFilters) =>
    getQuery(
      [...findingQueries.root(), "list", { entity: entity ?? "", status: status ?? "" }],
      withQuery("/api/findings", { entity, status }),
      findingListSchema,
      { placeholderData: keepPreviousData },
    ),
};

export function useCloseFinding() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: CloseFindingBody }) =>
      api.put(`/api/findings/${id}`, body, findingSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: findingQueries.root() }),
    // Someone else changed it: show the list as it now stands so the reader can decide again.
    onError: () => queryClient.invalidateQueries({ queryKey: findingQueries.root() }),
  });
}
