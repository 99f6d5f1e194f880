import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { EntityOverviewTable } from "@/features/entities/components/entity-overview-table";
import { overviewQueries } from "@/features/overview/api/overview-queries";
import { StandingTable } from "@/features/overview/components/standing-table";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";

/** Only the reporting office and the CRO read the live figures; the others see the entity list. */
const readsFigures = (role: Role | undefined) => role === "analyst" || role === "cro";

export const clientLoader = (queryClient: QueryClient) => async () => {
  const user = await queryClient.ensureQueryData(authQueries.me());
  await Promise.all([
    queryClient.ensureQueryData(entityQueries.all()),
    readsFigures(user?.role) ? queryClient.ensureQueryData(overviewQueries.list()) : undefined,
  ]);
  return null;
};

function FiguresNote({ role }: { role: string }) {
  const next =
    role === "admin"
      ? "Set up each entity's portfolios and holiday calendar so the daily data has somewhere to land."
      : "Approved figures reach you through the quarter's signed-off snapshots.";
  return (
    <p className="text-sm text-ink-muted">
      The live zones, exception counts and multipliers are for the reporting office and the chief risk officer until the
      quarter is signed off. {next}
    </p>
  );
}

function Standing() {
  const { data: items } = useSuspenseQuery(overviewQueries.list());
  return (
    <>
      <p className="text-sm text-ink-muted">
        Each entity's top-of-house portfolio on its latest day of data. The multiplier in force is the last quarterly
        determination's and stays until the next quarter end; the zone, count, multiplier and add-on beside it are
        indicative: the rolling count as if determined today. Open an entity for its backtest, the exceptions to explain
        and the roll-off calendar.
      </p>
      <StandingTable
        items={items}
        backtestHref={(p) => paths.backtest.href(p)}
        findingsHref={(entity) => paths.data.href({ entity })}
        quarterHref={(entity, snapshot) => paths.snapshots.href({ entity, snapshot })}
      />
    </>
  );
}

export default function OverviewRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const role = user!.role;
  return (
    <section aria-labelledby="overview-title" className="flex flex-col gap-4">
      <PageTitle>Overview</PageTitle>
      <CountedHeading id="overview-title" count={`${entities.length} ${entities.length === 1 ? "entity" : "entities"}`}>
        Overview
      </CountedHeading>
      {readsFigures(role) ? (
        <Standing />
      ) : (
        <>
          {entities.length > 0 && <FiguresNote role={role} />}
          <EntityOverviewTable
            entities={entities}
            role={role}
            addEntityHref={role === "admin" ? paths.adminEntities.href() : undefined}
          />
        </>
      )}
    </section>
  );
}
