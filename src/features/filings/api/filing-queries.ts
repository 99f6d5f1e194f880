import { useMutation, useQueryClient, type QueryClient } from "@tanstack/react-query";
import { filingListSchema, filingSchema, filingVerifySchema, type Filing } from "@shared/schemas/filing";
import { api, isApiError } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

const base = (id: number) => `/api/filings/${id}`;

/** The pack exactly as it was sent; a plain link downloads it with the session cookie. */
export const filingPackHref = (id: number) => `${base(id)}/pack.pdf`;

/**
 * Every key of the filings, from the broadest to one filing's check. They start with "filings", so
 * the shared "every figure" rule (lib/query-scope: all but "auth") refreshes them after a filing.
 */
export const filingKeys = {
  all: () => ["filings"] as const,
  list: () => [...filingKeys.all(), "list"] as const,
  verify: (id: number) => [...filingKeys.all(), "verify", id] as const,
};

export const filingQueries = {
  /** Newest first; a regulator receives only the entities assigned to them. */
  list: () => getQuery(filingKeys.list(), "/api/filings", filingListSchema),
  /** The server hashes the kept pack and checks its snapshot's chain each time it is asked; a cached answer would prove nothing. */
  verify: (id: number) =>
    getQuery(filingKeys.verify(id), `${base(id)}/verify`, filingVerifySchema, { staleTime: 0, gcTime: 0 }),
};

/**
 * A step on one filing (POST …/acknowledge, …/deliver) whose answer is the filing as it now stands:
 * the cached list shows it at once, then `reread` reads again what the step may have changed.
 */
function useFilingStep(
  id: number,
  step: "acknowledge" | "deliver",
  reread: (queryClient: QueryClient) => Promise<unknown>,
  onError?: (error: Error, queryClient: QueryClient) => unknown,
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post(`${base(id)}/${step}`, {}, filingSchema),
    onSuccess: (filing) => {
      queryClient.setQueryData(filingKeys.list(), (list: Filing[] | undefined) =>
        list?.map((f) => (f.id === filing.id ? filing : f)),
      );
      return reread(queryClient);
    },
    onError: onError && ((error) => onError(error, queryClient)),
  });
}

/** The supervisor confirms receipt; the answer carries who and when (asking twice changes nothing). */
export function useAcknowledgeFiling(id: number) {
  return useFilingStep(
    id,
    "acknowledge",
    (queryClient) => queryClient.invalidateQueries({ queryKey: filingKeys.list() }),
    // A filing no longer visible (the assignment was withdrawn) is news about the list: read it again.
    (error, queryClient) =>
      isApiError(error) && error.status === 404
        ? queryClient.invalidateQueries({ queryKey: filingKeys.list() })
        : undefined,
  );
}

/**
 * The CRO sends a filing that did not reach everyone to the recipients not yet accepted; the
 * answer is the filing as it now stands. The snapshots follow (the first acceptance files the quarter).
 */
export function useFinishFiling(id: number) {
  return useFilingStep(id, "deliver", (queryClient) => queryClient.invalidateQueries());
}
