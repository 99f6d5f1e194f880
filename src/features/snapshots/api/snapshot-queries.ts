import { useMutation, useQueryClient, type Query } from "@tanstack/react-query";
import {
  snapshotListSchema,
  snapshotSchema,
  snapshotVerifySchema,
  type CreateSnapshotBody,
  type ReturnInputsBody,
  type ReturnSnapshotBody,
  type Snapshot,
  type SnapshotActionBody,
} from "@shared/schemas/snapshot";
import { filingSchema } from "@shared/schemas/filing";
import { capitalOnDateSchema, determinationListSchema } from "@shared/schemas/determination";
import { api, isApiError, withQuery } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";
import { getQuery } from "@/lib/queries";

const base = (id: number) => `/api/snapshots/${id}`;

/** The snapshot's pack as the server renders it now; a plain link downloads it with the session cookie (a draft's says it is not signed off). */
export const snapshotPackHref = (id: number) => `${base(id)}/pack.pdf`;

/** Every key of the quarter snapshots, from the broadest to one snapshot's hash check. */
export const snapshotKeys = {
  all: () => ["snapshots"] as const,
  lists: () => [...snapshotKeys.all(), "list"] as const,
  list: (entity: string) => [...snapshotKeys.lists(), { entity }] as const,
  details: () => [...snapshotKeys.all(), "detail"] as const,
  detail: (id: number) => [...snapshotKeys.details(), id] as const,
  verify: (id: number) => [...snapshotKeys.detail(id), "verify"] as const,
  determinations: (entity: string) => [...snapshotKeys.all(), "determinations", entity] as const,
  inForceToday: (entity: string) => [...snapshotKeys.all(), "in-force-today", entity] as const,
};

export const snapshotQueries = {
  /** The entity's snapshots, newest quarter first (treasury receives only the signed-off ones). */
  list: (entity: string) =>
    getQuery(snapshotKeys.list(entity), withQuery("/api/snapshots", { entity }), snapshotListSchema),
  detail: (id: number) => getQuery(snapshotKeys.detail(id), base(id), snapshotSchema),
  /** The entity's determinations of the multiplier, oldest first (treasury receives the signed-off ones only). */
  determinations: (entity: string) =>
    getQuery(
      snapshotKeys.determinations(entity),
      `/api/entities/${encodeURIComponent(entity)}/determinations`,
      determinationListSchema,
    ),
  /** The multiplier in force today beside the indicative one (the reporting office and the CRO only). */
  inForceToday: (entity: string) =>
    getQuery(
      snapshotKeys.inForceToday(entity),
      `/api/entities/${encodeURIComponent(entity)}/capital`,
      capitalOnDateSchema,
    ),
  /** The server recomputes the hash chain each time it is asked; a cached answer would prove nothing. */
  verify: (id: number) =>
    getQuery(snapshotKeys.verify(id), `${base(id)}/verify`, snapshotVerifySchema, { staleTime: 0, gcTime: 0 }),
};

/** The error codes after which the snapshot still stands as the screen shows it (the reader fixes the cause, not the screen). */
const STANDS_AFTER: ReadonlySet<string> = new Set(["open_findings", "inputs_changed", "four_eyes"]);

/** A refusal because the snapshot changed under the reader (a stale version, another status): the form it came from may be gone once the screen reloads. */
export function isChangedMeanwhile(error: unknown): boolean {
  return isApiError(error) && error.status === 409 && !STANDS_AFTER.has(error.code);
}

/** The snapshot a 409 names (`details.snapshotId`): the one already standing in the way. */
export function blockingSnapshotOf(error: unknown): number | undefined {
  if (!isApiError(error) || error.status !== 409) return undefined;
  const id = (error.details as { snapshotId?: unknown } | null | undefined)?.snapshotId;
  return typeof id === "number" && Number.isInteger(id) && id > 0 ? id : undefined;
}

/** The filing a 409 on filing names (`details.filingId`): the quarter was filed already, by this reader or another. */
export function existingFilingOf(error: unknown): number | undefined {
  if (!isApiError(error) || error.status !== 409) return undefined;
  const id = (error.details as { filingId?: unknown } | null | undefined)?.filingId;
  return typeof id === "number" && Number.isInteger(id) && id > 0 ? id : undefined;
}

/**
 * After a change the server's answer is the snapshot as it now stands; everything else that shows
 * figures or a quarter's status goes stale (lists, capital history, overview). Features may not
 * import each other's keys, so the shared rule in query-scope decides what that is.
 */
function useStoreAnswer() {
  const queryClient = useQueryClient();
  return (snapshot: Snapshot) => {
    queryClient.setQueryData(snapshotKeys.detail(snapshot.id), snapshot);
    const detailKey = snapshotKeys.detail(snapshot.id);
    const isThisDetail = (q: Query) =>
      q.queryKey.length === detailKey.length && detailKey.every((k, i) => q.queryKey[i] === k);
    return queryClient.invalidateQueries({ predicate: (q) => everyFigure.predicate(q) && !isThisDetail(q) });
  };
}

/** A 409 or 403 is news about the snapshot (status, version, open findings): read it again. */
function useRereadOnRefusal() {
  const queryClient = useQueryClient();
  return (error: unknown) =>
    isApiError(error) && (error.status === 409 || error.status === 403)
      ? queryClient.invalidateQueries({ queryKey: snapshotKeys.all() })
      : undefined;
}

/** A change to one snapshot: its answer is stored (useStoreAnswer), a refusal that is news about it reads it again. */
function useSnapshotChange<T>(mutationFn: (body: T) => Promise<Snapshot>) {
  const store = useStoreAnswer();
  const reread = useRereadOnRefusal();
  return useMutation({
    mutationFn,
    onSuccess: (snapshot) => store(snapshot),
    onError: (error) => reread(error),
  });
}

/** Freezes the quarter's figures as a draft; for a draft or returned quarter the server recomputes it (200). */
export function usePrepareSnapshot() {
  return useSnapshotChange((body: CreateSnapshotBody) => api.post("/api/snapshots", body, snapshotSchema));
}

export function useSubmitSnapshot(id: number) {
  return useSnapshotChange((body: SnapshotActionBody) => api.post(`${base(id)}/submit`, body, snapshotSchema));
}

export function useApproveSnapshot(id: number) {
  return useSnapshotChange((body: SnapshotActionBody) => api.post(`${base(id)}/approve`, body, snapshotSchema));
}

/** The analyst's values of the return that the product does not hold, on a draft or returned snapshot. */
export function useSetReturnInputs(id: number) {
  return useSnapshotChange((body: ReturnInputsBody) => api.put(`${base(id)}/return-inputs`, body, snapshotSchema));
}

export function useReturnSnapshot(id: number) {
  return useSnapshotChange((body: ReturnSnapshotBody) => api.post(`${base(id)}/return`, body, snapshotSchema));
}

/**
 * The CRO files an approved snapshot: the server e-mails its pack to the entity's supervisor
 * contacts, keeps it, and the snapshot becomes filed. The answer is the filing; the snapshot, the
 * filings list and the capital history's status all go stale, and the shared "every figure" rule
 * covers them all ("snapshots", "filings", "capital" are none of them "auth"). The answer is 201
 * when the mail server took the pack, 202 when it is kept as pending (`delivery` says which).
 */
export function useFileSnapshot(id: number) {
  const queryClient = useQueryClient();
  const reread = useRereadOnRefusal();
  return useMutation({
    mutationFn: () => api.post(`${base(id)}/filings`, {}, filingSchema),
    onSuccess: () => queryClient.invalidateQueries(everyFigure),
    // "Already filed" is the same news as a filing that succeeded: the filings list (read by the
    // screen, whose key this feature may not import) goes stale with everything else.
    onError: (error) =>
      existingFilingOf(error) !== undefined ? queryClient.invalidateQueries(everyFigure) : reread(error),
  });
}
