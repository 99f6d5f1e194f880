import { keepPreviousData } from "@tanstack/react-query";
import {
  commitResultSchema,
  uploadListSchema,
  uploadPreviewSchema,
  uploadRowsPageSchema,
} from "@shared/schemas/upload";
import { api, withQuery } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";
import { getQuery, useRefreshingMutation } from "@/lib/queries";

/** The empty file with the header row and two example days; a plain download. */
export const TEMPLATE_URL = "/api/uploads/template.csv";

/** Rows of the file shown per page of the preview table (the server allows up to 500). */
export const PREVIEW_PAGE_SIZE = 100;

export type UploadRowsParams = { offset: number; limit: number; invalidOnly: boolean };

export const uploadQueries = {
  root: () => ["uploads"] as const,
  list: () => getQuery([...uploadQueries.root(), "list"], "/api/uploads", uploadListSchema, { staleTime: 10_000 }),
  detail: (id: number) => getQuery([...uploadQueries.root(), "detail", id], `/api/uploads/${id}`, uploadPreviewSchema),
  // A file's rows never change once uploaded.
  rows: (id: number, { offset, limit, invalidOnly }: UploadRowsParams) =>
    getQuery(
      [...uploadQueries.root(), "detail", id, "rows", { offset, limit, invalidOnly }],
      withQuery(`/api/uploads/${id}/rows`, { offset, limit, invalidOnly: String(invalidOnly) }),
      uploadRowsPageSchema,
      { placeholderData: keepPreviousData, staleTime: Infinity },
    ),
};

/** The first page a preview opens on: only the rows with errors when there are any. */
export function firstRowsPage(invalid: number): UploadRowsParams {
  return { offset: 0, limit: PREVIEW_PAGE_SIZE, invalidOnly: invalid > 0 };
}

/** Everything about uploads except the rows of a file, which never change once uploaded (and are gone after a discard). */
const allButRows = {
  queryKey: uploadQueries.root(),
  predicate: (q: { queryKey: readonly unknown[] }) => q.queryKey[3] !== "rows",
};

export function useCommitUpload() {
  return useRefreshingMutation(
    // confirmSignedOff: the person ticked that the file may restate days of signed-off quarters.
    ({ id, confirmSignedOff }: { id: number; confirmSignedOff?: boolean }) =>
      api.post(`/api/uploads/${id}/commit`, confirmSignedOff ? { confirmSignedOff } : {}, commitResultSchema),
    // Committed rows change the history, the findings and every figure computed from the data
    // (zone, count, multiplier, add-on on the Overview and Backtest screens): all but the rows of files.
    {
      predicate: (q) =>
        everyFigure.predicate(q) && !(q.queryKey[0] === uploadQueries.root()[0] && q.queryKey[3] === "rows"),
    },
  );
}

export function useDiscardUpload() {
  return useRefreshingMutation((id: number) => api.del(`/api/uploads/${id}`), allButRows);
}
