import { useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { UPLOAD_MAX_BYTES, UPLOAD_MAX_LABEL, uploadPreviewSchema, type UploadPreview } from "@shared/schemas/upload";
import { ApiError, answerOf, unreachable } from "@/lib/api-client";
import { uploadQueries } from "./upload-queries";

export type UploadProgress =
  | { phase: "sending"; loaded: number; total: number }
  /** Every byte is sent; the server parses and checks the rows before it answers. */
  | { phase: "checking" };

/**
 * POST /api/uploads with the file in the form field "file". XMLHttpRequest rather than fetch,
 * because only it reports the bytes sent while the request body goes out.
 */
export function sendUpload(file: File, onProgress: (p: UploadProgress) => void = () => {}): Promise<UploadPreview> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", "/api/uploads");
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (e) => {
      const total = e.lengthComputable && e.total > 0 ? e.total : file.size;
      if (e.loaded >= total) onProgress({ phase: "checking" });
      else onProgress({ phase: "sending", loaded: e.loaded, total });
    };
    xhr.upload.onload = () => onProgress({ phase: "checking" });
    xhr.onerror = () => reject(unreachable());
    xhr.onabort = () => reject(new ApiError(0, "aborted", "The upload was stopped before the server answered."));
    xhr.onload = () => {
      const text = typeof xhr.responseText === "string" ? xhr.responseText : "";
      try {
        resolve(
          answerOf({ status: xhr.status, statusText: xhr.statusText, text }, uploadPreviewSchema, "POST /api/uploads"),
        );
      } catch (error) {
        reject(error);
      }
    };
    const form = new FormData();
    form.append("file", file, file.name);
    onProgress({ phase: "sending", loaded: 0, total: file.size });
    xhr.send(form);
  });
}

/** Refuses before sending what the server would refuse anyway, so a wrong 200 MB file does not travel. */
export function checkBeforeSending(file: File): ApiError | null {
  if (!/\.csv$/i.test(file.name))
    return new ApiError(
      415,
      "unsupported_media_type",
      `${file.name} is not a .csv file. Save the data as CSV (comma-separated) and choose it again.`,
    );
  if (file.size > UPLOAD_MAX_BYTES)
    return new ApiError(
      413,
      "too_large",
      `${file.name} is larger than the ${UPLOAD_MAX_LABEL} a single upload may be. Split it by portfolio or by month.`,
    );
  if (file.size === 0)
    return new ApiError(
      422,
      "invalid_file",
      `${file.name} is empty. Start from the template, which has the header row.`,
    );
  return null;
}

/** Uploads a file for preview, reporting progress; the new preview lands in the cache. */
export function useSendUpload() {
  const queryClient = useQueryClient();
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const mutation = useMutation({
    mutationFn: (file: File) => {
      const refused = checkBeforeSending(file);
      if (refused) return Promise.reject(refused);
      return sendUpload(file, setProgress);
    },
    onSuccess: (preview) => {
      queryClient.setQueryData(uploadQueries.detail(preview.id).queryKey, preview);
      return queryClient.invalidateQueries({ queryKey: uploadQueries.list().queryKey });
    },
    onSettled: () => setProgress(null),
  });
  return { ...mutation, progress };
}
