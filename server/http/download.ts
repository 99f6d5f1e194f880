import type { Response } from "express";
import type { ExportFormat } from "../../shared/schemas/table-export";
import { tableDownload, type Table } from "../kit/table-export";

export interface Download {
  /** The name the browser saves it under. */
  fileName: string;
  contentType: string;
  bytes: Buffer | string;
  /** More headers, such as the file's SHA-256. */
  headers?: Record<string, string>;
}

/**
 * RFC 6266: the name in quotes, characters outside printable ASCII shown as "?" there; a name that
 * has any also goes as filename* in UTF-8 (RFC 8187), which browsers prefer.
 */
export function contentDisposition(fileName: string): string {
  const plain = fileName.replace(/[^\x20-\x7e]/g, "?").replace(/["\\]/g, "\\$&");
  const header = `attachment; filename="${plain}"`;
  if (/^[\x20-\x7e]*$/.test(fileName)) return header;
  const encoded = encodeURIComponent(fileName).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return `${header}; filename*=UTF-8''${encoded}`;
}

/** The one way a file leaves the API: always an attachment, never rendered by the browser. */
export function sendDownload(res: Response, download: Download): void {
  res.setHeader("Content-Type", download.contentType);
  res.setHeader("Content-Disposition", contentDisposition(download.fileName));
  for (const [name, value] of Object.entries(download.headers ?? {})) res.setHeader(name, value);
  res.send(download.bytes);
}

/** A table (server/kit/table-export.ts) as the download of the format its address asks for. */
export async function sendTable<Row>(res: Response, table: Table<Row>, format: ExportFormat): Promise<void> {
  sendDownload(res, await tableDownload(table, format));
}
