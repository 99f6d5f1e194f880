import { data, Link, useParams, type LoaderFunctionArgs } from "react-router-dom";
import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { EntityForm } from "@/features/entities/components/entity-form";
import { HolidaysPanel } from "@/features/entities/components/holidays-panel";
import { PortfoliosPanel } from "@/features/entities/components/portfolios-panel";
import { regimeLabels } from "@/lib/regime-labels";
import { PageTitle } from "@/components/ui/page-title";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const code = params.code ?? "";
    const [entities] = await Promise.all([
      queryClient.ensureQueryData(entityQueries.all()),
      queryClient.ensureQueryData(entityQueries.portfolios(code)),
      queryClient.ensureQueryData(entityQueries.holidays(code)),
    ]);
    if (!entities.some((e) => e.code === code))
      throw data(`There is no entity with the code ${code}.`, { status: 404 });
    return null;
  };

export default function EntityRoute() {
  const code = useParams().code ?? "";
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const { data: portfolios } = useSuspenseQuery(entityQueries.portfolios(code));
  const { data: holidays } = useSuspenseQuery(entityQueries.holidays(code));
  const entity = entities.find((e) => e.code === code);
  if (!entity) return <p className="text-sm">There is no entity with the code {code}.</p>;

  return (
    <div className="flex flex-col gap-8">
      <PageTitle>{`${entity.code} · Entities`}</PageTitle>
      <div>
        <p className="text-sm">
          <Link to={paths.adminEntities.href()}>Entities</Link>
          <span className="text-ink-faint"> / </span>
          <span className="text-ink-muted">{entity.code}</span>
        </p>
        <h1 className="mt-1">
          {entity.name} <span className="font-normal text-ink-muted">· {entity.code}</span>
        </h1>
        <p className="mt-1 text-sm text-ink-muted">
          {regimeLabels[entity.regime]} · {entity.currency} · {portfolios.length}{" "}
          {portfolios.length === 1 ? "portfolio" : "portfolios"} · {holidays.length}{" "}
          {holidays.length === 1 ? "holiday" : "holidays"}
        </p>
      </div>
      <section className="border-t border-rule pt-5">
        {/* Keyed by code so moving to another entity starts from its saved values. */}
        <EntityForm key={entity.code} mode="edit" entity={entity} />
      </section>
      <div className="grid grid-cols-1 gap-10 border-t border-rule pt-5 xl:grid-cols-2">
        <PortfoliosPanel entityCode={entity.code} portfolios={portfolios} isFrtb={entity.regime === "frtb"} />
        <HolidaysPanel entityCode={entity.code} country={entity.country} holidays={holidays} />
      </div>
    </div>
  );
}
