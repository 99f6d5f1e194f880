import { useEffect } from "react";
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { useQuery, useQueryClient, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { quarterLabel } from "@shared/backtest/quarters";
import { type Snapshot } from "@shared/schemas/snapshot";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { snapshotKeys, snapshotQueries } from "@/features/snapshots/api/snapshot-queries";
import { filingQueries } from "@/features/filings/api/filing-queries";
import { FilingDelivery } from "@/features/filings/components/filing-delivery";
import { PrepareSnapshotForm } from "@/features/snapshots/components/prepare-snapshot-form";
import { SnapshotDetail } from "@/features/snapshots/components/snapshot-detail";
import { SnapshotListTable } from "@/features/snapshots/components/snapshot-list-table";
import { TableDownloads } from "@/components/ui/table-downloads";
import { MultiplierStanding } from "@/features/snapshots/components/multiplier-standing";
import { endedQuarterEnds } from "@/features/snapshots/quarter-ends";
import { plural } from "@/lib/format";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";
import { CountedHeading } from "@/components/ui/page-title";
import { Loaded } from "@/components/ui/query-state";
import { FormMessage } from "@/components/ui/field";
import { EntityScreenHeader } from "@/components/ui/entity-screen-header";
import { EmptyState, useRowOpening } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";

function screenParams(search: URLSearchParams): { entity?: string; snapshot?: number } {
  const snapshot = Number(search.get("snapshot"));
  return {
    entity: search.get("entity")?.trim() || undefined,
    snapshot: Number.isInteger(snapshot) && snapshot > 0 ? snapshot : undefined,
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const { entity, snapshot } = screenParams(new URL(request.url).searchParams);
    const [entities, opened] = await Promise.all([
      queryClient.ensureQueryData(entityQueries.all()),
      // A missing or refused snapshot is said inside the screen, not instead of it.
      snapshot ? queryClient.ensureQueryData(snapshotQueries.detail(snapshot)).catch(() => undefined) : undefined,
    ]);
    // A snapshot belongs to one entity: an address naming another entity beside it follows the
    // snapshot (the thing asked for by its id), so its figures never show under another entity's name.
    if (opened && entity !== undefined && opened.entity !== entity)
      throw redirect(paths.snapshots.href({ entity: opened.entity, snapshot: opened.id }));
    const code = opened?.entity ?? entity ?? entities[0]?.code;
    const list = code
      ? await queryClient.ensureQueryData(snapshotQueries.list(code)).catch(() => undefined)
      : undefined;
    // The list carries headlines only: the newest quarter, opened by default, is read in full before the screen shows.
    if (!snapshot && list?.[0])
      await queryClient.ensureQueryData(snapshotQueries.detail(list[0].id)).catch(() => undefined);
    return null;
  };

/** A pack kept for the mail server goes as soon as the server answers: the screen looks again this often until it has. */
const PENDING_REREAD_MS = 15_000;

const intro: Record<Role, string> = {
  analyst:
    "Freeze a quarter's figures as a draft, check them, and submit them for sign-off. A chief risk officer approves and seals them.",
  cro: "Approve or return the quarters the analysts submit. Four eyes: you cannot approve a snapshot you prepared or submitted.",
  treasury: "The quarters signed off by the chief risk officer, with their figures as approved. Read only.",
  regulator: "",
  admin: "",
};

function emptyFor(role: Role, entity: string) {
  if (role === "treasury")
    return {
      title: `No signed-off quarters for ${entity} yet`,
      next: "Approved figures appear here once the chief risk officer signs a quarter off.",
    };
  if (role === "cro")
    return {
      title: `No snapshots for ${entity} yet`,
      next: "The analysts prepare each quarter; a submitted one waits here for your approval or return.",
    };
  return {
    title: `No snapshots for ${entity} yet`,
    next: "Choose an ended quarter above and prepare its snapshot: the figures are frozen as a draft for you to check and submit.",
  };
}

function SelectedSnapshot({
  id,
  role,
  userEmail,
  findingsHref,
  filingHref,
  onPrepared,
}: {
  id: number;
  role: Role;
  userEmail: string;
  findingsHref: (entity: string) => string;
  filingHref: (id: number) => string;
  onPrepared: (s: Snapshot) => void;
}) {
  // The list carries each quarter's headline only: days, exceptions and history come with the snapshot's own answer.
  const { data, error, isFetching } = useQuery(snapshotQueries.detail(id));
  // The supervisor contacts the filing confirmation names before anything is sent.
  const entities = useQuery(entityQueries.all());
  const entityRow = entities.data?.find((e) => e.code === data?.entity);
  const recipients = entityRow ? { name: entityRow.supervisorName, emails: entityRow.supervisorEmails } : undefined;
  const determinations = useQuery({ ...snapshotQueries.determinations(data?.entity ?? ""), enabled: !!data });
  // A filed quarter shows its filing, and an approved one may have a filing waiting for the mail
  // server; the filings list is the one place they are read from (treasury may not read it).
  const readsFiling =
    (role === "analyst" || role === "cro") && (data?.status === "filed" || data?.status === "approved");
  const filings = useQuery({
    ...filingQueries.list(),
    enabled: readsFiling,
    refetchInterval: (query) =>
      query.state.data?.some((f) => f.snapshotId === id && f.delivery === "pending") ? PENDING_REREAD_MS : false,
  });
  const filing = {
    filing: filings.data?.find((f) => f.snapshotId === id),
    reading: readsFiling && filings.isPending,
    error: filings.error,
  };
  // The pack went while the screen was open: the quarter is filed now, so read the snapshot (and the list's status) again.
  const queryClient = useQueryClient();
  const sentMeanwhile = data?.status === "approved" && !!filing.filing && filing.filing.delivery !== "pending";
  useEffect(() => {
    if (sentMeanwhile) void queryClient.invalidateQueries({ queryKey: snapshotKeys.all() });
  }, [sentMeanwhile, queryClient]);
  if (!data) {
    return error ? (
      <FormMessage>{isApiError(error) ? error.message : `Snapshot #${id} could not be read.`}</FormMessage>
    ) : (
      <p className="text-sm text-ink-muted">Opening snapshot #{id}…</p>
    );
  }
  return (
    <>
      {error && (
        <FormMessage>{isApiError(error) ? error.message : "The snapshot could not be read again."}</FormMessage>
      )}
      <SnapshotDetail
        snapshot={data}
        role={role}
        userEmail={userEmail}
        findingsHref={findingsHref(data.entity)}
        onPrepared={onPrepared}
        filing={filing}
        filingHref={filingHref}
        snapshotHref={(other) => paths.snapshots.href({ entity: data.entity, snapshot: other })}
        filingDelivery={(f) => <FilingDelivery filing={f} role={role} />}
        updating={isFetching}
        recipients={recipients}
        // A quarter with an amendment has one determination, that of the snapshot that stands (docs/api.md#amendments).
        determination={determinations.data?.find(
          (d) => d.quarterEnd === data.quarterEnd && (d.snapshotId === null || d.snapshotId === data.id),
        )}
      />
    </>
  );
}

export default function SnapshotsRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const params = screenParams(search);
  const role = user!.role;
  const opened = useQuery({ ...snapshotQueries.detail(params.snapshot ?? 0), enabled: params.snapshot !== undefined });
  // The snapshot's own entity wins over the address's (the loader also puts it in the address).
  const entity = opened.data?.entity ?? params.entity ?? entities[0]?.code ?? "";
  const list = useQuery({ ...snapshotQueries.list(entity), enabled: entity !== "" });
  const snapshots = list.data ?? [];
  const selectedId = params.snapshot ?? snapshots[0]?.id;
  const snapshotHref = (id: number) => paths.snapshots.href({ entity, snapshot: id });
  const opening = useRowOpening(snapshotHref, selectedId);
  const current = entities.find((e) => e.code === entity);
  const latest = snapshots[0];
  const capitalToday = useQuery({
    ...snapshotQueries.inForceToday(entity),
    enabled: entity !== "" && role !== "treasury",
  });
  const signedOff = useQuery({
    ...snapshotQueries.determinations(entity),
    enabled: entity !== "" && role === "treasury",
  });
  const waiting = snapshots.filter((s) => s.status === "submitted").length;

  return (
    <section aria-labelledby="quarters-title" className="flex flex-col gap-5">
      <EntityScreenHeader screen={paths.snapshots} titleId="quarters-title" plain entities={entities} entity={entity}>
        {intro[role]}
      </EntityScreenHeader>
      {entities.length === 0 ? (
        <EmptyState title="No legal entities are set up yet">
          An administrator adds the entities; their quarters can be closed here once they have data.
        </EmptyState>
      ) : (
        <>
          {list.data && (
            <dl className="flex flex-wrap gap-x-10 gap-y-2 text-sm" aria-label="Where the quarters stand">
              <div>
                <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Latest quarter</dt>
                <dd>
                  {latest ? (
                    <>
                      <span className="font-medium">{quarterLabel(latest.quarterEnd)}</span> ·{" "}
                      {snapshotStatusLabels[latest.status]}
                    </>
                  ) : (
                    <span className="text-ink-muted">None yet</span>
                  )}
                </dd>
              </div>
              {role !== "treasury" && (
                <div>
                  <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">
                    Waiting for sign-off
                  </dt>
                  <dd className="figures">
                    {waiting > 0 ? (
                      <span className="font-medium">{plural(waiting, "quarter", "quarters")}</span>
                    ) : (
                      "None"
                    )}
                  </dd>
                </div>
              )}
              {current && (
                <div>
                  <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Currency</dt>
                  <dd className="figures">{current.currency}</dd>
                </div>
              )}
            </dl>
          )}
          {current && (capitalToday.data || signedOff.data) && (
            <section aria-label="Multiplier in force" className="flex flex-col gap-1">
              <MultiplierStanding
                regime={current.regime}
                capital={capitalToday.data?.entity === entity ? capitalToday.data : undefined}
                signedOff={role === "treasury" ? signedOff.data : undefined}
              />
            </section>
          )}
          {role === "analyst" && (
            <section className="border-t border-rule pt-4">
              <PrepareSnapshotForm
                key={entity}
                entity={entity}
                quarterEnds={endedQuarterEnds(new Date())}
                snapshots={snapshots}
                snapshotHref={snapshotHref}
                onPrepared={(s) =>
                  navigate(paths.snapshots.href({ entity: s.entity, snapshot: s.id }), { preventScrollReset: true })
                }
              />
            </section>
          )}
          <section aria-labelledby="snapshots-title" className="flex flex-col gap-2 border-t border-rule pt-4">
            <CountedHeading
              level={2}
              id="snapshots-title"
              count={list.data ? plural(snapshots.length, "quarter", "quarters") : ""}
              loading={list.isFetching}
            >
              Snapshots of {entity}
            </CountedHeading>
            <Loaded query={list} what="the snapshots">
              <SnapshotListTable snapshots={snapshots} {...opening} empty={emptyFor(role, entity)} />
            </Loaded>
            {snapshots.length > 0 && (
              <TableDownloads path="/api/snapshots" query={{ entity }} what={`the snapshots of ${entity}`} />
            )}
          </section>
          {selectedId !== undefined && (
            <SelectedSnapshot
              key={selectedId}
              id={selectedId}
              role={role}
              userEmail={user!.email}
              findingsHref={(e) => paths.data.href({ entity: e })}
              filingHref={(f) => paths.filings.href({ filing: f })}
              onPrepared={(s) =>
                navigate(paths.snapshots.href({ entity: s.entity, snapshot: s.id }), { preventScrollReset: true })
              }
            />
          )}
        </>
      )}
    </section>
  );
}
