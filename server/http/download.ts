import type { Response } from "express";

export interface Download {
  /** The name the browser saves it under (Express writes the RFC 6266 header, with filename* when needed). */
  fileName: string;
  contentType: string;
  bytes: Buffer | string;
  /** More headers, such as the file's SHA-256. */
  headers?: Record<string, string>;
}

/** The one way a file leaves the API: always an attachment, never rendered by the browser. */
export function sendDownload(res: Response, download: Download): void {
  res.attachment(download.fileName);
  res.setHeader("Content-Type", download.contentType);
  for (const [name, value] of Object.entries(download.headers ?? {})) res.setHeader(name, value);
  res.send(download.bytes);
}
