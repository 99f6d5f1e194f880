import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { EntityOverviewTable } from "@/features/entities/components/entity-overview-table";
import { PageTitle } from "@/components/ui/page-title";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(entityQueries.all());
  return null;
};

function FiguresNote({ role }: { role: string }) {
  const next =
    role === "analyst"
      ? "Daily data upload comes with the Data screen."
      : role === "admin"
        ? "Set up each entity's portfolios and holiday calendar so the daily data has somewhere to land."
        : "They appear here once the reporting team has loaded the daily data.";
  return (
    <p className="text-sm text-ink-muted">
      Zones, exception counts, multipliers and capital add-ons appear here once daily VaR and P&amp;L data is loaded. {next}
    </p>
  );
}

export default function OverviewRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const role = user!.role;
  return (
    <section aria-labelledby="overview-title" className="flex flex-col gap-4">
        <PageTitle>Overview</PageTitle>
      <div className="flex items-baseline justify-between gap-4">
        <h1 id="overview-title">Overview</h1>
        <p className="figures text-sm text-ink-muted">
          {entities.length} {entities.length === 1 ? "entity" : "entities"}
        </p>
      </div>
      {entities.length > 0 && <FiguresNote role={role} />}
      <EntityOverviewTable entities={entities} role={role} addEntityHref={role === "admin" ? paths.adminEntities.href() : undefined} />
    </section>
  );
}
