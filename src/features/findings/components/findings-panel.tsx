import { Fragment, useRef, useState, type FormEvent } from "react";
import { useQuery } from "@tanstack/react-query";
import { closeFindingBodySchema, findingKindSchema, type Finding, type FindingKind } from "@shared/schemas/finding";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextareaField } from "@/components/ui/field";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { OpenedRow } from "@/components/ui/row-actions";
import { isApiError } from "@/lib/api-client";
import { formatCount, formatDateTime } from "@/lib/format";
import { focusFirstInvalid, validate, type FieldErrors } from "@/lib/form";
import { cn } from "@/lib/cn";
import { findingQueries, useCloseFinding, type FindingFilters } from "../api/finding-queries";
import { findingKindLabels, findingStatusLabels } from "../words";
import { PersonName } from "@/lib/people";

type Closing = "resolved" | "explained";

/** Findings drawn per page; the server sends the whole list for the filter. */
const FINDINGS_PAGE = 50;

function CloseFindingForm({
  finding,
  as,
  onDone,
  onConflict,
}: {
  finding: Finding;
  as: Closing;
  onDone: (message?: string) => void;
  onConflict: (message: string) => void;
}) {
  const close = useCloseFinding();
  const formRef = useRef<HTMLFormElement>(null);
  const [note, setNote] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});

  function submit(e: FormEvent) {
    e.preventDefault();
    close.reset();
    const r = validate(closeFindingBodySchema, { status: as, note, version: finding.version });
    if (!r.ok) {
      setErrors(r.errors);
      return focusFirstInvalid(formRef.current);
    }
    setErrors({});
    close.mutate(
      { id: finding.id, body: r.data },
      {
        onSuccess: (f) =>
          onDone(
            `${findingKindLabels[f.kind]} on ${f.portfolio} (${range(f)}) is now ${findingStatusLabels[f.status].toLowerCase()}.`,
          ),
        // The list is fetched again; the message stays above it even if this row leaves the filter.
        onError: (err) => isApiError(err) && err.status === 409 && onConflict(err.message),
      },
    );
  }

  const failed = close.error && !(isApiError(close.error) && close.error.status === 409) ? close.error : undefined;
  const label = as === "resolved" ? "How was it resolved?" : "Why is it acceptable?";
  const hint =
    as === "resolved"
      ? "For example: the missing day was uploaded in file #123."
      : "For example: the desk was closed that week; no positions, no P&L.";
  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-label={`${as === "resolved" ? "Resolve" : "Explain"} finding #${finding.id}`}
      className="flex flex-col gap-2"
    >
      <FormMessage>
        {failed ? (isApiError(failed) ? failed.message : "The change could not be saved.") : undefined}
      </FormMessage>
      <TextareaField
        label={label}
        hint={hint}
        value={note}
        onChange={(e) => setNote(e.target.value)}
        rows={2}
        error={errors.note}
      />
      <div className="flex items-center gap-3">
        <Button type="submit" size="sm" disabled={close.isPending}>
          {close.isPending ? "Saving…" : as === "resolved" ? "Mark resolved" : "Record explanation"}
        </Button>
        <Button variant="quiet" size="sm" onClick={() => onDone()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function range(f: Finding) {
  return f.from === f.to ? f.from : `${f.from} – ${f.to}`;
}

/** Data-quality findings: gaps, stale VaR, one-sided days and outliers, with who closed them and why. */
export function FindingsPanel({
  filters,
  entities,
  canClose,
  onFilter,
}: {
  filters: FindingFilters;
  entities: { code: string; name: string }[];
  canClose: boolean;
  onFilter: (next: FindingFilters) => void;
}) {
  const { data: findings, error, isFetching, isPlaceholderData } = useQuery(findingQueries.list(filters));
  const [open, setOpen] = useState<{ id: number; as: Closing } | null>(null);
  const [notice, setNotice] = useState<string>();
  const [conflict, setConflict] = useState<string>();
  const [kind, setKind] = useState<FindingKind | "">("");
  const filterKey = `${filters.entity ?? ""}|${filters.status ?? ""}|${kind}`;
  const [paging, setPaging] = useState({ key: filterKey, page: 0 });
  const page = paging.key === filterKey ? paging.page : 0;
  const all = findings ?? [];
  const matching = kind ? all.filter((f) => f.kind === kind) : all;
  const pages = Math.max(1, Math.ceil(matching.length / FINDINGS_PAGE));
  const list = matching.slice(page * FINDINGS_PAGE, (page + 1) * FINDINGS_PAGE);
  const columns = canClose ? 8 : 7;

  const statusWord = filters.status ? findingStatusLabels[filters.status].toLowerCase() : "";
  const where = filters.entity ? ` for ${filters.entity}` : "";

  return (
    <section aria-labelledby="findings-title" className="flex flex-col gap-3 border-t border-rule pt-4">
      <div className="flex flex-wrap items-baseline justify-between gap-4">
        <h2 id="findings-title">Data-quality findings</h2>
        <p className="figures text-sm text-ink-muted" aria-live="polite">
          {findings ? `${formatCount(all.length)} ${statusWord || "in all"}${where}` : ""}
          {findings && kind ? ` · ${formatCount(matching.length)} ${findingKindLabels[kind].toLowerCase()}` : ""}
          {isFetching && " · loading…"}
        </p>
      </div>
      <p className="text-sm text-ink-muted">
        Checked after every commit: business days with no row, VaR unchanged five days or more, P&amp;L without VaR or
        the reverse, and |P&amp;L| above five times VaR. Open findings inside a quarter hold up its sign-off.
      </p>
      <div role="search" aria-label="Filter the findings" className="flex flex-wrap items-end gap-3">
        <SelectField
          label="Entity"
          value={filters.entity ?? ""}
          onChange={(e) => onFilter({ ...filters, entity: e.target.value || undefined })}
          className="w-64"
        >
          <option value="">All entities</option>
          {entities.map((e) => (
            <option key={e.code} value={e.code}>
              {e.code} · {e.name}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Status"
          value={filters.status ?? "all"}
          onChange={(e) =>
            onFilter({
              ...filters,
              status: e.target.value === "all" ? undefined : (e.target.value as FindingFilters["status"]),
            })
          }
          className="w-44"
        >
          <option value="open">Open</option>
          <option value="resolved">Resolved</option>
          <option value="explained">Explained</option>
          <option value="all">Any status</option>
        </SelectField>
        <SelectField
          label="What"
          value={kind}
          onChange={(e) => setKind(findingKindSchema.safeParse(e.target.value).data ?? "")}
          className="w-56"
        >
          <option value="">Every kind</option>
          {findingKindSchema.options.map((k) => (
            <option key={k} value={k}>
              {findingKindLabels[k]}
            </option>
          ))}
        </SelectField>
      </div>
      <FormMessage tone="done">{notice}</FormMessage>
      <FormMessage>{conflict}</FormMessage>
      <FormMessage>
        {error ? (isApiError(error) ? error.message : "The findings could not load.") : undefined}
      </FormMessage>
      {findings && all.length > 0 && matching.length === 0 ? (
        <EmptyState title={`No ${findingKindLabels[kind as FindingKind].toLowerCase()} findings here`}>
          Choose “Every kind” to see the other findings.
        </EmptyState>
      ) : findings && list.length === 0 ? (
        filters.status === "open" ? (
          <EmptyState title={`No open findings${where}`}>
            The stored data has no gaps, stale VaR, one-sided days or outliers to look at. New checks run after the next
            commit; choose “Any status” to read how earlier findings were closed.
          </EmptyState>
        ) : (
          <EmptyState title={`No ${statusWord || ""} findings${where}`.replace("  ", " ")}>
            Try another entity or status. Findings appear once daily data is committed.
          </EmptyState>
        )
      ) : findings ? (
        <div className={isPlaceholderData ? "opacity-60" : undefined}>
          <Table caption="Data-quality findings">
            <TableHead
              columns={[
                "Entity",
                "Portfolio",
                "What",
                "Business dates",
                "Detail",
                "Status",
                "Closed by",
                ...(canClose ? [{ actions: "Actions" }] : []),
              ]}
            />
            <tbody>
              {list.map((f) => (
                <Fragment key={f.id}>
                  <Tr>
                    <Td>{f.entity}</Td>
                    <Td className="whitespace-nowrap">{f.portfolio}</Td>
                    <Td className="whitespace-nowrap">{findingKindLabels[f.kind]}</Td>
                    <Td className="figures whitespace-nowrap">{range(f)}</Td>
                    <Td className="max-w-md">{f.detail}</Td>
                    <Td className={cn("whitespace-nowrap", f.status === "open" && "font-medium")}>
                      {findingStatusLabels[f.status]}
                      {f.note && <p className="max-w-xs text-xs whitespace-normal text-ink-muted">“{f.note}”</p>}
                    </Td>
                    <Td className="text-xs">
                      {f.closedBy ? (
                        <>
                          <PersonName email={f.closedBy} />
                          <br />
                          <span className="figures text-ink-muted">{formatDateTime(f.closedAt)}</span>
                        </>
                      ) : (
                        <span className="text-ink-faint">—</span>
                      )}
                    </Td>
                    {canClose && (
                      <Td className="text-right whitespace-nowrap">
                        {f.status === "open" && (
                          <div className="flex justify-end gap-3">
                            {(["resolved", "explained"] as const).map((as) => {
                              const word = as === "resolved" ? "Resolve" : "Explain";
                              const expanded = open?.id === f.id && open.as === as;
                              return (
                                <Button
                                  key={as}
                                  variant="quiet"
                                  size="sm"
                                  aria-expanded={expanded}
                                  aria-label={`${word} finding #${f.id}: ${findingKindLabels[f.kind]} on ${f.portfolio}`}
                                  onClick={() => {
                                    setNotice(undefined);
                                    setConflict(undefined);
                                    setOpen(expanded ? null : { id: f.id, as });
                                  }}
                                >
                                  {word}
                                </Button>
                              );
                            })}
                          </div>
                        )}
                      </Td>
                    )}
                  </Tr>
                  {open?.id === f.id && (
                    <OpenedRow colSpan={columns}>
                      <CloseFindingForm
                        key={open.as}
                        finding={f}
                        as={open.as}
                        onConflict={setConflict}
                        onDone={(message) => {
                          setConflict(undefined);
                          setOpen(null);
                          if (message) setNotice(message);
                        }}
                      />
                    </OpenedRow>
                  )}
                </Fragment>
              ))}
            </tbody>
          </Table>
          {pages > 1 && (
            <nav aria-label="Pages of findings" className="mt-2 flex items-center gap-3 text-sm">
              <Button
                variant="secondary"
                size="sm"
                disabled={page === 0}
                onClick={() => setPaging({ key: filterKey, page: page - 1 })}
              >
                Previous {FINDINGS_PAGE}
              </Button>
              <span className="figures text-ink-muted">
                {formatCount(page * FINDINGS_PAGE + 1)}–{formatCount(page * FINDINGS_PAGE + list.length)} of{" "}
                {formatCount(matching.length)}
              </span>
              <Button
                variant="secondary"
                size="sm"
                disabled={page + 1 >= pages}
                onClick={() => setPaging({ key: filterKey, page: page + 1 })}
              >
                Next {FINDINGS_PAGE}
              </Button>
            </nav>
          )}
        </div>
      ) : null}
    </section>
  );
}
