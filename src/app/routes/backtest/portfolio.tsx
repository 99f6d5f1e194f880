import { lazy, memo, Suspense, useCallback, useState, type FormEvent } from "react";
import { Link, useNavigate, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { keepPreviousData, useQuery, useQueryClient, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { BacktestResponse } from "@shared/schemas/backtest";
import type { Role } from "@shared/schemas/common";
import { NoticesStanding } from "@/features/notices/components/notices-standing";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { overviewQueries } from "@/features/overview/api/overview-queries";
import { backtestQueries } from "@/features/backtest/api/backtest-queries";
import { WhereWeStand } from "@/features/backtest/components/where-we-stand";
import { TestsPanel } from "@/features/backtest/components/tests-panel";
import { RollOffTable } from "@/components/ui/roll-off-table";
import { DesksTable } from "@/features/backtest/components/desks-table";
import { ExceptionTable } from "@/features/backtest/components/exception-table";
import { TableDownloads } from "@/components/ui/table-downloads";
import { ReviewPanel } from "@/features/reviews/components/review-panel";
import { PortfolioPicker } from "@/features/backtest/components/portfolio-picker";
import { plural } from "@/lib/format";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { PageTitle } from "@/components/ui/page-title";
import { EmptyState } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";

const Charts = {
  Pnl: lazy(() => import("@/features/backtest/components/charts").then((m) => ({ default: m.PnlChart }))),
  Rolling: lazy(() => import("@/features/backtest/components/charts").then((m) => ({ default: m.RollingChart }))),
};

const isoDate = /^\d{4}-\d{2}-\d{2}$/;
const asOfOf = (search: URLSearchParams) => {
  const v = search.get("asOf");
  return v && isoDate.test(v) ? v : undefined;
};

/** How much history the P&L chart shows before the window starts, so the shaded window has context. */
const CONTEXT_DAYS = 125;

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const code = params.portfolio ?? "";
    const asOf = asOfOf(new URL(request.url).searchParams);
    await Promise.all([
      // No data yet, or a bad date, is said inside the screen rather than instead of it.
      queryClient.ensureQueryData(backtestQueries.detail(code, asOf)).catch(() => undefined),
      queryClient.ensureQueryData(backtestQueries.rolling(code)).catch(() => undefined),
      queryClient.ensureQueryData(entityQueries.all()),
    ]);
    return null;
  };

function ChartSlot({ height }: { height: number }) {
  return (
    <div
      style={{ height }}
      className="flex items-center justify-center border border-dashed border-rule text-xs text-ink-muted"
    >
      Drawing the chart…
    </div>
  );
}

/** Memoised: choosing an exception changes the address, and the charts need not redraw for it. */
const Why = memo(function Why({ bt, code }: { bt: BacktestResponse; code: string }) {
  const rolling = useQuery(backtestQueries.rolling(code));
  const rows = rolling.data ?? [];
  const startAt = bt.window.start ? rows.findIndex((r) => r.date === bt.window.start) : -1;
  const from = rolling.data
    ? startAt >= 0
      ? rows[Math.max(0, startAt - CONTEXT_DAYS)].date
      : (bt.window.start ?? undefined)
    : undefined;
  const observations = useQuery({
    ...backtestQueries.observations(code, from, bt.latestDate),
    enabled: rolling.isSuccess,
  });
  return (
    <section aria-labelledby="why-title" className="flex flex-col gap-5">
      <h2 id="why-title">Why: the days, the trend and the tests</h2>
      {observations.error && (
        <FormMessage>
          {isApiError(observations.error) ? observations.error.message : "The daily data could not be read."}
        </FormMessage>
      )}
      <Suspense fallback={<ChartSlot height={300} />}>
        {observations.data ? <Charts.Pnl bt={bt} observations={observations.data} /> : <ChartSlot height={300} />}
      </Suspense>
      {rolling.error && (
        <FormMessage>
          {isApiError(rolling.error) ? rolling.error.message : "The rolling count could not be read."}
        </FormMessage>
      )}
      <Suspense fallback={<ChartSlot height={220} />}>
        {rolling.data ? (
          <Charts.Rolling rows={rolling.data} regime={bt.regime} asOf={bt.asOf} />
        ) : (
          <ChartSlot height={220} />
        )}
      </Suspense>
      {rolling.data && rolling.data.length > 0 && (
        <TableDownloads path={`/api/portfolios/${bt.portfolio.code}/rolling`} what="the rolling count" />
      )}
      <TestsPanel bt={bt} />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
        <RollOffTable rollOffs={bt.rollOffs} regime={bt.regime} />
        <DesksTable desks={bt.desks} />
      </div>
    </section>
  );
});

function WhatNext({ bt, code, role }: { bt: BacktestResponse; code: string; role: Role }) {
  const [search, setSearch] = useSearchParams();
  const selected = bt.exceptionDays.find((d) => d.date === search.get("exception")) ?? null;
  const select = useCallback(
    (date: string) =>
      setSearch(
        (s) => {
          const next = new URLSearchParams(s);
          next.set("exception", date);
          return next;
        },
        { replace: true, preventScrollReset: true },
      ),
    [setSearch],
  );
  const unreviewed = bt.exceptionDays.filter((d) => d.review === null).length;
  const requested = bt.exceptionDays.filter((d) => d.review?.exclusionStatus === "requested").length;
  const todo =
    bt.exceptionDays.length === 0
      ? "Nothing to explain."
      : role === "analyst"
        ? unreviewed > 0
          ? `${plural(unreviewed, "exception is", "exceptions are")} waiting for an explanation.`
          : "Every exception in the window is explained."
        : requested > 0
          ? `${plural(requested, "exclusion request waits", "exclusion requests wait")} for the supervisor's decision to be recorded.`
          : "No exclusion request is waiting for a decision.";
  return (
    <section id="exceptions" aria-labelledby="next-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="next-title">What next: exceptions and their reviews</h2>
        <p className="text-sm text-ink-soft">{todo}</p>
      </div>
      {bt.exceptionDays.length > 0 && (
        <TableDownloads
          path={`/api/portfolios/${bt.portfolio.code}/exceptions`}
          query={{ asOf: bt.asOf }}
          what="the exceptions and their reviews"
        />
      )}
      <ExceptionTable
        days={bt.exceptionDays}
        currency={bt.entity.currency}
        selected={selected?.date ?? null}
        onSelect={select}
      />
      {selected ? (
        <ReviewPanel
          code={code}
          day={selected}
          role={role}
          currency={bt.entity.currency}
          alsoInvalidate={[backtestQueries.root(), overviewQueries.root()]}
        />
      ) : (
        bt.exceptionDays.length > 0 && (
          <p className="text-sm text-ink-muted">
            Choose an exception to {role === "analyst" ? "explain it" : "read its review"}.
          </p>
        )
      )}
    </section>
  );
}

function AsOfForm({ bt }: { bt: BacktestResponse }) {
  const [search, setSearch] = useSearchParams();
  const [value, setValue] = useState(bt.asOf);
  const [shown, setShown] = useState(bt.asOf);
  if (shown !== bt.asOf) {
    setShown(bt.asOf);
    setValue(bt.asOf);
  }
  const go = (asOf: string | null) => {
    const next = new URLSearchParams(search);
    next.delete("exception");
    if (asOf && asOf !== bt.latestDate) next.set("asOf", asOf);
    else next.delete("asOf");
    setSearch(next, { preventScrollReset: true });
  };
  return (
    <form
      className="flex items-end gap-2"
      onSubmit={(e: FormEvent) => {
        e.preventDefault();
        if (isoDate.test(value)) go(value);
      }}
    >
      <div className="flex flex-col gap-1">
        <label htmlFor="as-of" className="text-xs font-medium text-ink-soft">
          As of
        </label>
        {/* A text field rather than the browser's date picker, so the date reads YYYY-MM-DD whatever the browser's locale. */}
        <input
          id="as-of"
          type="text"
          inputMode="numeric"
          pattern="[0-9]{4}-[0-9]{2}-[0-9]{2}"
          placeholder="YYYY-MM-DD"
          value={value}
          onChange={(e) => setValue(e.target.value.trim())}
          aria-describedby="as-of-hint"
          aria-invalid={value !== "" && !isoDate.test(value) ? true : undefined}
          className="figures h-8 w-28 rounded-sm border border-rule-control bg-paper-raised px-2 text-sm focus:outline-2 focus:outline-accent aria-invalid:border-danger"
        />
        <span id="as-of-hint" className="sr-only">
          A business date, YYYY-MM-DD, on or before {bt.latestDate}
        </span>
      </div>
      <Button type="submit" variant="secondary" size="sm" className="mb-0.5">
        Show
      </Button>
      {bt.asOf !== bt.latestDate && (
        <Button variant="quiet" size="sm" className="mb-0.5" onClick={() => go(null)}>
          Latest ({bt.latestDate})
        </Button>
      )}
    </form>
  );
}

export default function BacktestRoute() {
  const code = useParams().portfolio ?? "";
  const [search] = useSearchParams();
  const asOf = asOfOf(search);
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const backtest = useQuery({ ...backtestQueries.detail(code, asOf), placeholderData: keepPreviousData });
  const bt = backtest.data && backtest.data.portfolio.code === code.toUpperCase() ? backtest.data : undefined;
  const entity = bt?.entity.code ?? entities[0]?.code ?? "";
  const portfolios = useQuery({ ...entityQueries.portfolios(entity), enabled: entity !== "" });
  const inForceDate = bt && bt.asOf !== bt.latestDate ? bt.asOf : undefined;
  const capital = useQuery({ ...backtestQueries.inForce(bt?.entity.code ?? "", inForceDate), enabled: !!bt });

  const openEntity = async (e: string) => {
    const list = await queryClient.ensureQueryData(entityQueries.portfolios(e));
    const top = list.find((p) => p.level === "top") ?? list[0];
    if (top) navigate(paths.backtest.href(top.code));
  };

  const noData = isApiError(backtest.error) && backtest.error.code === "no_data";
  return (
    <div className="flex flex-col gap-6">
      <PageTitle>{`Backtest ${code}`}</PageTitle>
      <header className="flex flex-wrap items-end justify-between gap-4 border-b border-rule pb-3">
        <div className="flex flex-col gap-0.5">
          <h1>Backtest{bt ? `: ${bt.portfolio.name}` : ""}</h1>
          <p className="text-sm text-ink-soft">
            <span className="figures font-medium">{code}</span>
            {bt && (
              <>
                {" "}
                · {bt.entity.name} · {bt.entity.currency} · as of <span className="figures">{bt.asOf}</span>
                {bt.asOf !== bt.latestDate && <> (latest data {bt.latestDate})</>}
                {backtest.isFetching && <span className="text-ink-muted"> · updating…</span>}
              </>
            )}
          </p>
        </div>
        <div className="flex flex-wrap items-end gap-4">
          <PortfolioPicker
            entities={entities}
            entity={entity}
            portfolios={portfolios.data}
            portfolio={portfolios.data?.some((p) => p.code === code.toUpperCase()) ? code.toUpperCase() : null}
            onEntity={(e) => void openEntity(e)}
            onPortfolio={(p) => navigate(paths.backtest.href(p))}
          />
          {bt && <AsOfForm bt={bt} />}
        </div>
      </header>
      {backtest.isPending ? (
        <p className="text-sm text-ink-muted">Reading the backtest…</p>
      ) : noData ? (
        <EmptyState title={`No daily data for ${code} yet`}>
          An analyst uploads the daily P&amp;L and VaR under <Link to={paths.data.href()}>Data</Link>; the backtest
          appears here as soon as the first day is committed.
        </EmptyState>
      ) : !bt ? (
        <FormMessage>
          {isApiError(backtest.error) ? backtest.error.message : "The backtest could not be read."}
          {isApiError(backtest.error) && backtest.error.code === "no_data_before" && (
            <>
              {" "}
              <Link to={paths.backtest.href(code)}>Show the latest day</Link>
            </>
          )}
        </FormMessage>
      ) : (
        <>
          {backtest.error && (
            <FormMessage>
              {isApiError(backtest.error) ? backtest.error.message : "The backtest could not be updated."}
            </FormMessage>
          )}
          {bt.regime === "eu" && bt.portfolio.level === "top" && user!.role !== "treasury" && (
            <NoticesStanding entity={bt.entity.code} />
          )}
          <WhereWeStand
            bt={bt}
            capital={capital.data?.entity === bt.entity.code ? capital.data : undefined}
            capitalError={
              capital.error
                ? isApiError(capital.error)
                  ? capital.error.message
                  : "The multiplier in force could not be read."
                : undefined
            }
          />
          <Why bt={bt} code={code} />
          <WhatNext bt={bt} code={code} role={user!.role} />
          <p className="text-2xs text-ink-faint">Figures by the backtesting engine {bt.engineVersion}.</p>
        </>
      )}
    </div>
  );
}
