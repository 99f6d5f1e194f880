import { keepPreviousData, queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import {
  commitResultSchema,
  uploadListSchema,
  uploadPreviewSchema,
  uploadRowsPageSchema,
} from "@shared/schemas/upload";
import { api, withQuery } from "@/lib/api-client";
import { everyFigure } from "@/lib/query-scope";

/** The empty file with the header row and two example days; a plain download. */
export const TEMPLATE_URL = "/api/uploads/template.csv";

/** Rows of the file shown per page of the preview table (the server allows up to 500). */
export const PREVIEW_PAGE_SIZE = 100;

export type UploadRowsParams = { offset: number; limit: number; invalidOnly: boolean };

export const uploadQueries = {
  root: () => ["uploads"] as const,
  list: () =>
    queryOptions({
      queryKey: [...uploadQueries.root(), "list"] as const,
      queryFn: () => api.get("/api/uploads", uploadListSchema),
      staleTime: 10_000,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...uploadQueries.root(), "detail", id] as const,
      queryFn: () => api.get(`/api/uploads/${id}`, uploadPreviewSchema),
    }),
  rows: (id: number, { offset, limit, invalidOnly }: UploadRowsParams) =>
    queryOptions({
      queryKey: [...uploadQueries.root(), "detail", id, "rows", { offset, limit, invalidOnly }] as const,
      queryFn: () =>
        api.get(
          withQuery(`/api/uploads/${id}/rows`, { offset, limit, invalidOnly: String(invalidOnly) }),
          uploadRowsPageSchema,
        ),
      placeholderData: keepPreviousData,
      // A file's rows never change once uploaded.
      staleTime: Infinity,
    }),
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
  const queryClient = useQueryClient();
  return useMutation({
    // confirmSignedOff: the person ticked that the file may restate days of signed-off quarters.
    mutationFn: ({ id, confirmSignedOff }: { id: number; confirmSignedOff?: boolean }) =>
      api.post(`/api/uploads/${id}/commit`, confirmSignedOff ? { confirmSignedOff } : {}, commitResultSchema),
    // Committed rows change the history, the findings and every figure computed from the data
    // (zone, count, multiplier, add-on on the Overview and Backtest screens): all but the rows of files.
    onSuccess: () =>
      queryClient.invalidateQueries({
        predicate: (q) =>
          everyFigure.predicate(q) && !(q.queryKey[0] === uploadQueries.root()[0] && q.queryKey[3] === "rows"),
      }),
  });
}

export function useDiscardUpload() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.del(`/api/uploads/${id}`),
    onSuccess: () => queryClient.invalidateQueries(allButRows),
  });
}
