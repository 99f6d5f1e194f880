import { redirect } from "react-router-dom";
import { useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { PageTitle } from "@/components/ui/page-title";
import { EmptyState } from "@/components/ui/table";

/** /backtest opens the first entity's top-of-house portfolio; the picker on that screen moves on from there. */
export const clientLoader = (queryClient: QueryClient) => async () => {
  const entities = await queryClient.ensureQueryData(entityQueries.all());
  for (const e of entities) {
    const portfolios = await queryClient.ensureQueryData(entityQueries.portfolios(e.code));
    const top = portfolios.find((p) => p.level === "top") ?? portfolios[0];
    if (top) return redirect(paths.backtest.href(top.code));
  }
  return null;
};

export default function BacktestIndexRoute() {
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  return (
    <section aria-labelledby="backtest-title" className="flex flex-col gap-4">
      <PageTitle>Backtest</PageTitle>
      <h1 id="backtest-title">Backtest</h1>
      <EmptyState title={entities.length === 0 ? "No legal entities are set up yet" : "No portfolio to backtest yet"}>
        An administrator adds each entity's top-of-house and desk portfolios; their backtests open here once daily data
        is loaded.
      </EmptyState>
    </section>
  );
}
