import { PortfolioModel } from "../../models/portfolio";
import { NotFoundError } from "../../errors";
import { EntityModel } from "../../models/entity";
import { loadSeries } from "./observations.repository";
import { backtestingActualPnl } from "../../../shared/backtest/pnl-definition";
import type { ObservationDto } from "../../../shared/schemas/observation";
import { PNL_COMPONENTS, RISK_MEASURES } from "../../../shared/schemas/common";
import { valuesOrNull } from "../../kit/values";

/** The current version of each stored day of one portfolio. */
export async function listObservations(code: string, range: { from?: string; to?: string }): Promise<ObservationDto[]> {
  const portfolio = await PortfolioModel.findOne({ where: { code }, include: [{ model: EntityModel, as: "entity" }] });
  if (!portfolio) throw new NotFoundError(`No portfolio ${code}.`);
  const series = await loadSeries(portfolio.id, "as supplied", range.from, range.to);
  const regime = (portfolio as PortfolioModel & { entity: EntityModel }).entity.regime;
  return series.map((o) => ({
    date: o.date,
    actualPnl: o.actualPnl,
    // docs/rules.md#pnl-definition: what the entity's rule set compares with VaR (the supplied figure without parts).
    backtestActualPnl: backtestingActualPnl(o, regime),
    hypotheticalPnl: o.hypotheticalPnl,
    ...valuesOrNull(o, RISK_MEASURES),
    ...valuesOrNull(o, PNL_COMPONENTS),
    version: o.version,
  }));
}
