import { useMutation, useQueryClient, type QueryKey } from "@tanstack/react-query";
import { reviewSchema, type DecisionBody, type Review, type ReviewBody } from "@shared/schemas/review";
import { answerOf, api, ApiError, fetchApi, staleCurrent } from "@/lib/api-client";

const exceptionBase = (code: string, date: string) =>
  `/api/portfolios/${encodeURIComponent(code)}/exceptions/${encodeURIComponent(date)}`;

/** A 409 answer carries the review as it now stands; read it so the user can see it and re-apply. */
export function currentReviewOf(error: unknown): Review | null {
  return staleCurrent(error, reviewSchema) ?? null;
}

/**
 * After a review, a decision or new evidence, every figure that depends on it is refetched: the
 * caller names them (the backtest's counted, zone and multiplier, the rolling count, the overview),
 * since features do not import each other's key factories.
 */
function useRefreshFigures(alsoInvalidate: readonly QueryKey[]) {
  const queryClient = useQueryClient();
  return () => Promise.all(alsoInvalidate.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}

/** Writes the review or the supervisor's decision of one exception; the figures are read again after it. */
function useReviewWrite<B>(
  code: string,
  date: string,
  part: "review" | "decision",
  alsoInvalidate: readonly QueryKey[],
) {
  const refresh = useRefreshFigures(alsoInvalidate);
  return useMutation({
    mutationFn: (body: B) => api.put(`${exceptionBase(code, date)}/${part}`, body, reviewSchema),
    onSuccess: () => refresh(),
    // Someone else saved first: what they saved becomes the version the next save builds on.
    onError: (error) => (currentReviewOf(error) ? refresh() : undefined),
  });
}

export function useSaveReview(code: string, date: string, alsoInvalidate: readonly QueryKey[] = []) {
  return useReviewWrite<ReviewBody>(code, date, "review", alsoInvalidate);
}

export function useRecordDecision(code: string, date: string, alsoInvalidate: readonly QueryKey[] = []) {
  return useReviewWrite<DecisionBody>(code, date, "decision", alsoInvalidate);
}

/** The server's limit on one evidence file (server/modules/exceptions: EVIDENCE_MAX_BYTES). */
export const EVIDENCE_MAX_BYTES = 10 * 1024 * 1024;
export const EVIDENCE_ACCEPT =
  ".pdf,.png,.jpg,.jpeg,.txt,.csv,.eml,application/pdf,image/png,image/jpeg,text/plain,text/csv,message/rfc822";

/** POST the file as multipart form field "file", through the same request core as the JSON calls. */
async function sendEvidence(code: string, date: string, file: File): Promise<Review> {
  if (file.size > EVIDENCE_MAX_BYTES) {
    throw new ApiError(413, "too_large", `${file.name} is larger than the 10 MB an evidence file may be.`);
  }
  const form = new FormData();
  form.append("file", file, file.name);
  const res = await fetchApi(`${exceptionBase(code, date)}/evidence`, {
    method: "POST",
    body: form,
    headers: { Accept: "application/json" },
  });
  const answer = { status: res.status, statusText: res.statusText, text: await res.text() };
  return answerOf(answer, reviewSchema, "the evidence upload");
}

export function useAddEvidence(code: string, date: string, alsoInvalidate: readonly QueryKey[] = []) {
  const refresh = useRefreshFigures(alsoInvalidate);
  return useMutation({
    mutationFn: (file: File) => sendEvidence(code, date, file),
    onSuccess: () => refresh(),
  });
}

/** Where an evidence file downloads from (always as an attachment). */
export const evidenceHref = (id: number) => `/api/evidence/${id}`;
