import { Link, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { keepPreviousData, useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { SIGNED_OFF } from "@shared/schemas/snapshot";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { capitalQueries } from "@/features/capital/api/capital-queries";
import { CapitalStanding } from "@/features/capital/components/capital-standing";
import { CapitalHistory } from "@/features/capital/components/capital-history";
import { TableDownloads } from "@/components/ui/table-downloads";
import { ZoneForecast } from "@/features/capital/components/zone-forecast";
import { WhatIfForm } from "@/features/capital/components/what-if-form";
import { FrtbAggregation } from "@/features/capital/components/frtb-aggregation";
import { RollOffTable } from "@/components/ui/roll-off-table";
import { Loaded } from "@/components/ui/query-state";
import { FormMessage } from "@/components/ui/field";
import { EntityScreenHeader } from "@/components/ui/entity-screen-header";
import { EmptyState } from "@/components/ui/table";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { entityOf } from "@/lib/entity-choice";

const isoDate = /^\d{4}-\d{2}-\d{2}$/;

function screenParams(search: URLSearchParams): { entity?: string; date?: string } {
  const date = search.get("date")?.trim();
  return { entity: search.get("entity")?.trim() || undefined, date: date && isoDate.test(date) ? date : undefined };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const { entity, date } = screenParams(new URL(request.url).searchParams);
    const entities = await queryClient.ensureQueryData(entityQueries.all());
    const code = entityOf(entities, entity);
    // No data yet, or a refused date, is said inside the screen rather than instead of it.
    if (code)
      await Promise.all([
        queryClient.ensureQueryData(capitalQueries.history(code)).catch(() => undefined),
        queryClient.ensureQueryData(capitalQueries.forecast(code, date)).catch(() => undefined),
      ]);
    return null;
  };

const intro: Record<Role, string> = {
  analyst:
    "Every quarter's multiplier and add-on, signed off or not, when old exceptions leave the window, and where the zone may stand next.",
  cro: "Every quarter's multiplier and add-on, signed off or not, when old exceptions leave the window, and where the zone may stand next.",
  treasury:
    "The signed-off capital history, what the next exception would cost, when old exceptions leave the window, and scenarios to plan with. Read only.",
  regulator: "",
  admin: "",
};

function historyEmpty(role: Role, entity: string) {
  if (role === "treasury")
    return {
      title: `No signed-off quarters for ${entity} yet`,
      next: "The history fills in as the chief risk officer signs each quarter off.",
    };
  return {
    title: `No quarter snapshots for ${entity} yet`,
    next: "A quarter appears here once an analyst prepares its snapshot under Quarter close.",
  };
}

export default function CapitalRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const params = screenParams(search);
  const role = user!.role;
  const entity = entityOf(entities, params.entity);
  const current = entities.find((e) => e.code === entity);

  const history = useQuery({ ...capitalQueries.history(entity), enabled: entity !== "" });
  const dated = useQuery({
    ...capitalQueries.forecast(entity, params.date),
    enabled: entity !== "",
    placeholderData: keepPreviousData,
  });
  // While another date is read, the last answer stays on screen, but never another entity's.
  const forecast = dated.data && dated.data.entity.toUpperCase() === entity.toUpperCase() ? dated.data : undefined;
  // A refused date leaves "where we stand" and the roll-offs to the default forecast, which holds the same figures for today.
  const fallback = useQuery({
    ...capitalQueries.forecast(entity),
    enabled: entity !== "" && params.date !== undefined && dated.isError,
  });
  const standing = forecast ?? fallback.data;
  const entityError =
    params.date === undefined ? dated.error : dated.isError && fallback.isError ? fallback.error : null;
  const dateError =
    params.date !== undefined && dated.isError && !fallback.isError
      ? (fieldErrorsOf(dated.error).date ??
        (isApiError(dated.error) ? dated.error.message : "The forecast for this date could not be read."))
      : undefined;

  // The server sends treasury only signed-off quarters; the screen holds to the same rule so a draft never reads as approved to them.
  const items = (history.data ?? []).filter((i) => role !== "treasury" || SIGNED_OFF.has(i.status));
  const currency = current?.currency ?? standing?.currency ?? "";
  const regime = current?.regime ?? standing?.regime ?? "";
  const noData = isApiError(entityError) && entityError.code === "no_data";
  // FRTB: the MAR33 aggregation today (the reporting office's current figures; treasury reads signed-off quarters).
  const onDate = useQuery({
    ...capitalQueries.onDate(entity),
    enabled: entity !== "" && regime === "frtb" && role !== "treasury",
  });

  return (
    <section aria-labelledby="capital-title" className="flex flex-col gap-6">
      <EntityScreenHeader screen={paths.capital} titleId="capital-title" entities={entities} entity={entity}>
        {intro[role]}
      </EntityScreenHeader>
      {entities.length === 0 ? (
        <EmptyState title="No legal entities are set up yet">
          An administrator adds the entities; their capital figures appear here once they have data.
        </EmptyState>
      ) : (
        <>
          {standing ? (
            <CapitalStanding forecast={standing} />
          ) : noData ? (
            <EmptyState title={`No daily data for ${entity} yet`}>
              {role === "treasury" ? (
                "The forecast and scenarios appear once the reporting office loads the entity's daily P&L and VaR."
              ) : (
                <>
                  An analyst uploads the daily P&amp;L and VaR under <Link to={paths.data.href({ entity })}>Data</Link>;
                  the forecast and scenarios appear as soon as the first day is committed.
                </>
              )}
            </EmptyState>
          ) : entityError ? (
            <FormMessage>
              {isApiError(entityError) ? entityError.message : "Today's figures could not be read."}
            </FormMessage>
          ) : (
            <p className="text-sm text-ink-muted">Reading today's figures…</p>
          )}

          {onDate.data &&
            onDate.data.entity.toUpperCase() === entity.toUpperCase() &&
            onDate.data.frtbTimeline !== undefined && (
              <FrtbAggregation
                figures={onDate.data.frtb}
                note={onDate.data.frtbNote}
                timeline={onDate.data.frtbTimeline}
                currency={onDate.data.currency}
                date={onDate.data.date}
              />
            )}

          <Loaded query={history} what="the capital history">
            <CapitalHistory items={items} currency={currency} regime={regime} empty={historyEmpty(role, entity)} />
            {items.length > 0 && (
              <TableDownloads
                path={`/api/entities/${entity}/capital/history`}
                what={`the capital history of ${entity}`}
              />
            )}
          </Loaded>

          {standing && (
            <>
              <ZoneForecast
                key={entity}
                forecast={forecast}
                requested={params.date}
                isDefault={params.date === undefined}
                dateError={dateError}
                pending={dated.isFetching}
                onDate={(date) => navigate(paths.capital.href({ entity, date }), { preventScrollReset: true })}
              />
              <RollOffTable rollOffs={standing.rollOffs} regime={standing.regime} by={forecast?.date} heading="h2" />
              <WhatIfForm key={`what-if-${entity}`} entity={entity} regime={standing.regime} />
            </>
          )}
        </>
      )}
    </section>
  );
}
