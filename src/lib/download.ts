import { useCallback, useRef, useState } from "react";
import { apiErrorFrom, fetchApi, isApiError, jsonOf } from "@/lib/api-client";

/**
 * The file name a server gave in its Content-Disposition header: the RFC 5987 `filename*=UTF-8''…`
 * form when present, else the plain `filename="…"`. Null when it named none.
 */
export function fileNameFromDisposition(header: string | null): string | null {
  if (!header) return null;
  const star = /filename\*\s*=\s*([^']*)'[^']*'([^;]+)/i.exec(header);
  if (star?.[2]) {
    try {
      return clean(decodeURIComponent(star[2].trim().replace(/^"|"$/g, "")));
    } catch {
      // A malformed encoding: fall through to the plain form.
    }
  }
  const plain = /filename\s*=\s*(?:"((?:\\.|[^"\\])*)"|([^;]+))/i.exec(header);
  const name = plain?.[1]?.replace(/\\(.)/g, "$1") ?? plain?.[2]?.trim();
  return name ? clean(name) : null;
}

/** Only the last path segment, so a name can never point the save anywhere else. */
function clean(name: string): string | null {
  const last = name.split(/[\\/]/).pop()?.trim();
  return last ? last : null;
}

/** Hands a Blob to the browser's save under `name`, through a short-lived object URL. */
export function saveBlob(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  a.rel = "noopener";
  a.style.display = "none";
  document.body.append(a);
  try {
    a.click();
  } finally {
    a.remove();
    // The click has started the save; the URL can go once the browser has read it.
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  }
}

/**
 * Fetches a file from our API (same origin, with the session cookie) and saves it under the name the
 * server gave, so a refused download says why in the server's words instead of failing in the
 * browser's download bar. `error` holds that message until the next try.
 */
export function useDownload(href: string, fallbackName: string, accept = "application/pdf, application/json;q=0.9") {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const inFlight = useRef(false);

  const start = useCallback(async () => {
    if (inFlight.current) return;
    inFlight.current = true;
    setBusy(true);
    setError(null);
    try {
      let res: Response;
      try {
        res = await fetchApi(href, { headers: { Accept: accept } });
      } catch (e) {
        setError(isApiError(e) ? e.message : String(e));
        return;
      }
      if (!res.ok) {
        const text = await res.text().catch(() => "");
        setError(apiErrorFrom(res.status, res.statusText, jsonOf(text)).message);
        return;
      }
      const blob = await res.blob();
      saveBlob(blob, fileNameFromDisposition(res.headers.get("Content-Disposition")) ?? fallbackName);
    } catch {
      setError("The download broke off before the file arrived. Try again.");
    } finally {
      inFlight.current = false;
      setBusy(false);
    }
  }, [href, fallbackName, accept]);

  return { start, busy, error };
}
