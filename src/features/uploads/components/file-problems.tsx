import { Link } from "react-router-dom";
import { rowErrorSchema, type RowError } from "@shared/schemas/upload";
import { isApiError } from "@/lib/api-client";
import { formatCount } from "@/lib/format";

/** `details.errors` of a refused file (422 invalid_file), when the server sent them. */
function problemsOf(details: unknown): RowError[] {
  if (typeof details !== "object" || details === null) return [];
  const list = (details as { errors?: unknown }).errors;
  if (!Array.isArray(list)) return [];
  return list.flatMap((e) => {
    const p = rowErrorSchema.safeParse(e);
    return p.success ? [p.data] : [];
  });
}

function titleOf(status: number, code: string): string {
  if (status === 409) return "This file is already in";
  if (status === 413) return "The file is too large";
  if (status === 415) return "This is not a CSV file";
  if (status === 422 || code === "invalid_file") return "The file cannot be read as daily data";
  if (status === 0) return "The file did not reach the server";
  if (status === 403) return "Uploading is not open to your role";
  return "The file was not accepted";
}

/** What is wrong with the file as a whole (not a row): shown beside the upload panel. */
export function FileProblems({
  error,
  fileName,
  uploadHref,
}: {
  error: unknown;
  fileName?: string;
  uploadHref: (id: number) => string;
}) {
  if (!error) return null;
  const status = isApiError(error) ? error.status : -1;
  const code = isApiError(error) ? error.code : "";
  const message = error instanceof Error ? error.message : "The file could not be uploaded.";
  const problems = isApiError(error) ? problemsOf(error.details) : [];
  const earlier = status === 409 ? /#(\d+)/.exec(message)?.[1] : undefined;

  return (
    <div
      role="alert"
      aria-labelledby="file-problems-title"
      className="flex flex-col gap-2 border-l-2 border-danger bg-danger-soft/60 px-3 py-2"
    >
      <h3 id="file-problems-title" className="text-sm font-semibold text-danger">
        {titleOf(status, code)}
      </h3>
      {fileName && <p className="text-xs break-all text-ink-muted">{fileName}</p>}
      <p className="text-sm text-ink">{message}</p>
      {problems.length > 0 && (
        <>
          <p className="text-xs text-ink-soft">
            {problems.length === 1 ? "One problem" : `${formatCount(problems.length)} problems`} to fix before uploading
            again:
          </p>
          <ul className="flex flex-col gap-0.5 text-sm" aria-label="Problems with the file">
            {problems.map((p, i) => (
              <li key={i} className="grid grid-cols-[auto_1fr] gap-x-2">
                <span className="figures text-xs whitespace-nowrap text-ink-muted">
                  Line {formatCount(p.line)}
                  {p.column ? ` · ${p.column}` : ""}
                </span>
                <span>{p.message}</span>
              </li>
            ))}
          </ul>
        </>
      )}
      {earlier && (
        <p className="text-sm">
          <Link to={uploadHref(Number(earlier))}>Open upload #{earlier}</Link>
        </p>
      )}
      {status === 422 && problems.length > 0 && (
        <p className="text-xs text-ink-muted">
          Compare the header row with the template: column names in lower case, each once.
        </p>
      )}
    </div>
  );
}
