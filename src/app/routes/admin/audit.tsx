import { useEffect, useState, type FormEvent } from "react";
import { Link, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { useQuery, type QueryClient } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import {
  AUDIT_PAGE_SIZE,
  auditQueries,
  type AuditFilter,
  type AuditPageParams,
} from "@/features/admin/api/audit-queries";
import { TableDownloads } from "@/components/ui/table-downloads";
import { AuditTable } from "@/features/admin/components/audit-table";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";

const DAY = /^\d{4}-\d{2}-\d{2}$/;

function pageParams(search: URLSearchParams): AuditPageParams {
  const page = Math.max(1, Math.floor(Number(search.get("page") ?? "1")) || 1);
  const text = (key: string) => search.get(key)?.trim() || undefined;
  const day = (key: string) => (DAY.test(search.get(key) ?? "") ? (search.get(key) as string) : undefined);
  return { page, action: text("action"), actor: text("actor"), from: day("from"), to: day("to") };
}

const filterOf = ({ action, actor, from, to }: AuditFilter): AuditFilter => ({ action, actor, from, to });

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await queryClient.ensureQueryData(auditQueries.page(pageParams(new URL(request.url).searchParams)));
    return null;
  };

export default function AuditRoute() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const params = pageParams(search);
  const { data, error, isFetching, isPlaceholderData } = useQuery(auditQueries.page(params));
  const applied = filterOf(params);
  const filtered = Object.values(applied).some(Boolean);
  const [draft, setDraft] = useState<AuditFilter>(applied);
  const appliedKey = JSON.stringify(applied);
  useEffect(() => setDraft(JSON.parse(appliedKey) as AuditFilter), [appliedKey]);
  const set = (key: keyof AuditFilter) => (e: { target: { value: string } }) =>
    setDraft((d) => ({ ...d, [key]: e.target.value }));
  const spanReversed = Boolean(draft.from && draft.to && draft.from > draft.to);

  const total = data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / AUDIT_PAGE_SIZE));
  const first = total === 0 ? 0 : (params.page - 1) * AUDIT_PAGE_SIZE + 1;
  const last = Math.min(total, params.page * AUDIT_PAGE_SIZE);
  const knownActions = [...new Set(data?.items.map((e) => e.action) ?? [])].sort();

  function filter(e: FormEvent) {
    e.preventDefault();
    if (spanReversed) return;
    const clean = (v?: string) => v?.trim() || undefined;
    navigate(
      paths.adminAudit.href({
        action: clean(draft.action),
        actor: clean(draft.actor),
        from: clean(draft.from),
        to: clean(draft.to),
      }),
    );
  }

  return (
    <section aria-labelledby="audit-title" className="flex flex-col gap-3">
      <PageTitle>Audit log</PageTitle>
      <CountedHeading
        id="audit-title"
        count={
          total === 0
            ? "No events"
            : `${first.toLocaleString("en-GB")}–${last.toLocaleString("en-GB")} of ${total.toLocaleString("en-GB")}`
        }
        loading={isFetching}
        countProps={{ "aria-live": "polite" }}
      >
        Audit log
      </CountedHeading>
      <p className="text-sm text-ink-muted">
        Every sign-in, failed sign-in and administrative change, newest first. Entries cannot be edited.
      </p>
      <form
        onSubmit={filter}
        className="flex flex-wrap items-end gap-2"
        role="search"
        aria-label="Filter the audit log"
      >
        <TextField
          label="Action"
          list="audit-actions"
          value={draft.action ?? ""}
          onChange={set("action")}
          className="w-56"
          placeholder="e.g. user.create"
        />
        <TextField
          label="Person (e-mail)"
          value={draft.actor ?? ""}
          onChange={set("actor")}
          className="w-56"
          placeholder="e.g. a.moreau"
        />
        <TextField label="From" type="date" value={draft.from ?? ""} onChange={set("from")} className="w-40" />
        <TextField
          label="To"
          type="date"
          value={draft.to ?? ""}
          onChange={set("to")}
          className="w-40"
          error={spanReversed ? "The last day comes before the first" : undefined}
        />
        <datalist id="audit-actions">
          {knownActions.map((a) => (
            <option key={a} value={a} />
          ))}
        </datalist>
        <Button type="submit" variant="secondary">
          Filter
        </Button>
        {filtered && (
          <Link to={paths.adminAudit.href()} className="pb-2 text-sm">
            Clear filter
          </Link>
        )}
      </form>
      {total > 0 && <TableDownloads path="/api/audit-events" query={applied} what="these events" />}
      <FormMessage>
        {error ? (isApiError(error) ? error.message : "The audit log could not load.") : undefined}
      </FormMessage>
      <div className={isPlaceholderData ? "opacity-60" : undefined}>
        <AuditTable events={data?.items ?? []} filtered={filtered} />
      </div>
      {pages > 1 && (
        <nav aria-label="Audit log pages" className="flex items-center gap-4 text-sm">
          {params.page > 1 ? (
            <Link to={paths.adminAudit.href({ ...applied, page: params.page - 1 })}>Newer</Link>
          ) : (
            <span className="text-ink-faint">Newer</span>
          )}
          <span className="figures text-ink-muted">
            Page {params.page} of {pages}
          </span>
          {params.page < pages ? (
            <Link to={paths.adminAudit.href({ ...applied, page: params.page + 1 })}>Older</Link>
          ) : (
            <span className="text-ink-faint">Older</span>
          )}
        </nav>
      )}
    </section>
  );
}
