import { useEffect, useRef } from "react";
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { UploadSummary } from "@shared/schemas/upload";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { findingQueries, type FindingFilters } from "@/features/findings/api/finding-queries";
import { firstRowsPage, uploadQueries } from "@/features/uploads/api/upload-queries";
import { UploadPanel } from "@/features/uploads/components/upload-panel";
import { UploadPreviewPanel } from "@/features/uploads/components/upload-preview";
import { UploadHistoryTable } from "@/features/uploads/components/upload-history-table";
import { FindingsPanel } from "@/features/findings/components/findings-panel";
import { TableDownloads } from "@/components/ui/table-downloads";
import { FormMessage } from "@/components/ui/field";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";
import { isApiError } from "@/lib/api-client";
import { formatCount, formatDateTime, plural } from "@/lib/format";

const findingStatuses = ["open", "resolved", "explained"] as const;

function screenParams(search: URLSearchParams): { upload?: number; filters: FindingFilters } {
  const upload = Number(search.get("upload"));
  const status = search.get("status");
  return {
    upload: Number.isInteger(upload) && upload > 0 ? upload : undefined,
    filters: {
      entity: search.get("entity")?.trim() || undefined,
      // Open findings are the work; "all" shows every status.
      status: status === "all" ? undefined : (findingStatuses.find((s) => s === status) ?? "open"),
    },
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const { upload, filters } = screenParams(new URL(request.url).searchParams);
    const opening = upload
      ? // A missing or unreadable upload is said inside the screen, not instead of it.
        queryClient
          .ensureQueryData(uploadQueries.detail(upload))
          .then((p) =>
            p.status === "discarded"
              ? undefined
              : queryClient.ensureQueryData(uploadQueries.rows(p.id, firstRowsPage(p.invalid))),
          )
          .catch(() => undefined)
      : undefined;
    await Promise.all([
      queryClient.ensureQueryData(uploadQueries.list()),
      queryClient.ensureQueryData(findingQueries.list(filters)),
      queryClient.ensureQueryData(findingQueries.list({ status: "open" })),
      queryClient.ensureQueryData(entityQueries.all()),
      opening,
    ]);
    return null;
  };

function StandingLine({ uploads }: { uploads: UploadSummary[] }) {
  const { data: open } = useQuery(findingQueries.list({ status: "open" }));
  const waiting = uploads.filter((u) => u.status === "preview").length;
  const latest = uploads
    .filter((u) => u.status === "committed")
    .sort((a, b) => (b.committedAt ?? "").localeCompare(a.committedAt ?? ""))[0];
  return (
    <dl className="flex flex-wrap gap-x-10 gap-y-2 border-y border-rule py-2 text-sm">
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Latest committed file</dt>
        <dd>
          {latest ? (
            <>
              #{latest.id} · days up to <span className="figures">{latest.to ?? "—"}</span>
              <span className="text-ink-muted"> · {formatDateTime(latest.committedAt)}</span>
            </>
          ) : (
            <span className="text-ink-muted">None yet</span>
          )}
        </dd>
      </div>
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Previews not committed</dt>
        <dd className="figures">{formatCount(waiting)}</dd>
      </div>
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Open data-quality findings</dt>
        <dd className="figures">
          {open ? (
            open.length > 0 ? (
              <span className="font-medium">{plural(open.length, "finding", "findings")}</span>
            ) : (
              "None"
            )
          ) : (
            "—"
          )}
        </dd>
      </div>
    </dl>
  );
}

function SelectedUpload({ id, canChange, onDiscarded }: { id: number; canChange: boolean; onDiscarded: () => void }) {
  const { data, error } = useQuery(uploadQueries.detail(id));
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = ref.current;
    if (el && el.getBoundingClientRect().top > window.innerHeight * 0.6)
      el.scrollIntoView?.({ block: "start", behavior: "smooth" });
  }, [id]);
  return (
    <div ref={ref} className="scroll-mt-4">
      {data ? (
        <UploadPreviewPanel key={data.id} preview={data} canChange={canChange} onDiscarded={onDiscarded} />
      ) : error ? (
        <FormMessage>{isApiError(error) ? error.message : `Upload #${id} could not load.`}</FormMessage>
      ) : (
        <p className="text-sm text-ink-muted">Opening upload #{id}…</p>
      )}
    </div>
  );
}

export default function DataRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: uploads } = useSuspenseQuery(uploadQueries.list());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { upload, filters } = screenParams(search);
  const isAnalyst = user?.role === "analyst";
  const current = { upload, entity: filters.entity, status: filters.status ?? ("all" as const) };
  const uploadHref = (id: number) => paths.data.href({ ...current, upload: id });

  return (
    <section aria-labelledby="data-title" className="flex flex-col gap-5">
      <PageTitle>Data</PageTitle>
      <div className="flex flex-col gap-1">
        <h1 id="data-title">Daily data</h1>
        <p className="text-sm text-ink-muted">
          {isAnalyst
            ? "Upload the day's VaR and P&L, check the preview row by row, then commit. Restated days keep their earlier versions."
            : "What the analysts have uploaded and committed, and the data-quality findings on the stored days. Read only."}
        </p>
      </div>
      <StandingLine uploads={uploads} />
      {isAnalyst && <UploadPanel uploadHref={uploadHref} onUploaded={(p) => navigate(uploadHref(p.id))} />}
      {upload && (
        <SelectedUpload
          id={upload}
          canChange={isAnalyst}
          onDiscarded={() => navigate(paths.data.href({ ...current, upload: undefined }))}
        />
      )}
      <FindingsPanel
        filters={filters}
        entities={entities}
        canClose={isAnalyst}
        onFilter={(f) =>
          navigate(paths.data.href({ upload, entity: f.entity, status: f.status ?? "all" }), { replace: true })
        }
      />
      <TableDownloads
        path="/api/findings"
        query={{ entity: filters.entity, status: filters.status }}
        what="these findings"
      />
      <section aria-labelledby="history-title" className="flex flex-col gap-2 border-t border-rule pt-4">
        <CountedHeading level={2} id="history-title" count={plural(uploads.length, "file", "files")}>
          Upload history
        </CountedHeading>
        <UploadHistoryTable
          uploads={uploads}
          selectedId={upload}
          hrefOf={uploadHref}
          onOpen={(id) => navigate(uploadHref(id))}
          canUpload={isAnalyst}
        />
        {uploads.length > 0 && <TableDownloads path="/api/uploads" what="the upload history" />}
      </section>
    </section>
  );
}
