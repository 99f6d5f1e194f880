import { useMutation, useQueryClient, type QueryKey } from "@tanstack/react-query";
import { apiErrorSchema } from "@shared/schemas/common";
import { reviewSchema, type DecisionBody, type Review, type ReviewBody } from "@shared/schemas/review";
import { api, ApiError } from "@/lib/api-client";

const exceptionBase = (code: string, date: string) =>
  `/api/portfolios/${encodeURIComponent(code)}/exceptions/${encodeURIComponent(date)}`;

/** A 409 answer carries the review as it now stands; read it so the user can see it and re-apply. */
export function currentReviewOf(error: unknown): Review | null {
  if (!(error instanceof ApiError) || error.status !== 409) return null;
  const current = (error.details as { current?: unknown } | null | undefined)?.current;
  const parsed = reviewSchema.safeParse(current);
  return parsed.success ? parsed.data : null;
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

export function useSaveReview(code: string, date: string, alsoInvalidate: readonly QueryKey[] = []) {
  const refresh = useRefreshFigures(alsoInvalidate);
  return useMutation({
    mutationFn: (body: ReviewBody) => api.put(`${exceptionBase(code, date)}/review`, body, reviewSchema),
    onSuccess: () => refresh(),
    // Someone else saved first: what they saved becomes the version the next save builds on.
    onError: (error) => (currentReviewOf(error) ? refresh() : undefined),
  });
}

export function useRecordDecision(code: string, date: string, alsoInvalidate: readonly QueryKey[] = []) {
  const refresh = useRefreshFigures(alsoInvalidate);
  return useMutation({
    mutationFn: (body: DecisionBody) => api.put(`${exceptionBase(code, date)}/decision`, body, reviewSchema),
    onSuccess: () => refresh(),
    onError: (error) => (currentReviewOf(error) ? refresh() : undefined),
  });
}

/** The server's limit on one evidence file (server/modules/exceptions: EVIDENCE_MAX_BYTES). */
export const EVIDENCE_MAX_BYTES = 10 * 1024 * 1024;
export const EVIDENCE_ACCEPT =
  ".pdf,.png,.jpg,.jpeg,.txt,.csv,.eml,application/pdf,image/png,image/jpeg,text/plain,text/csv,message/rfc822";

/** POST the file as multipart form field "file"; the API client speaks JSON only, so this one call uses fetch directly. */
async function sendEvidence(code: string, date: string, file: File): Promise<Review> {
  if (file.size > EVIDENCE_MAX_BYTES) {
    throw new ApiError(413, "too_large", `${file.name} is larger than the 10 MB an evidence file may be.`);
  }
  const form = new FormData();
  form.append("file", file, file.name);
  let res: Response;
  try {
    res = await fetch(`${exceptionBase(code, date)}/evidence`, {
      method: "POST",
      body: form,
      headers: { Accept: "application/json" },
      credentials: "same-origin",
    });
  } catch {
    throw new ApiError(0, "network_error", "The server could not be reached. Check your connection and try again.");
  }
  const text = await res.text();
  let json: unknown;
  try {
    json = text ? JSON.parse(text) : undefined;
  } catch {
    json = undefined;
  }
  if (!res.ok) {
    const e = apiErrorSchema.safeParse(json);
    if (e.success) throw new ApiError(res.status, e.data.error.code, e.data.error.message, e.data.error.details);
    throw new ApiError(res.status, "http_error", `The server answered ${res.status}.`);
  }
  const parsed = reviewSchema.safeParse(json);
  if (!parsed.success)
    throw new ApiError(
      res.status,
      "unexpected_response",
      "The server's answer to the evidence upload did not have the expected shape.",
    );
  return parsed.data;
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
