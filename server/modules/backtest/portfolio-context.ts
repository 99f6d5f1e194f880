import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { HolidayModel } from "../../models/holiday";
import { ExceptionReviewModel } from "../../models/exception-review";
import { NotFoundError } from "../../errors";
import { loadSeries } from "../observations/observations.repository";
import type { Observation } from "../../../shared/backtest/types";
import { getRegime } from "../../../shared/backtest/regimes";
import { withMissingBusinessDays } from "../../../shared/backtest/window";

export interface PortfolioContext {
  portfolio: PortfolioModel;
  entity: EntityModel;
  holidays: Set<string>;
  series: Observation[];
  /** Dates whose exception the supervisor agreed to disregard. */
  excludedDates: Set<string>;
}

export async function findPortfolio(code: string): Promise<{ portfolio: PortfolioModel; entity: EntityModel }> {
  const portfolio = await PortfolioModel.findOne({ where: { code }, include: [{ model: EntityModel, as: "entity" }] });
  if (!portfolio) throw new NotFoundError(`No portfolio ${code}.`);
  return { portfolio, entity: (portfolio as unknown as { entity: EntityModel }).entity };
}

/** Everything the engine needs for one portfolio: its current data, its calendar and its approved exclusions. */
export async function loadPortfolioContext(code: string): Promise<PortfolioContext> {
  const { portfolio, entity } = await findPortfolio(code);
  const [holidays, series, approved] = await Promise.all([
    HolidayModel.findAll({ where: { entityId: entity.id } }),
    loadSeries(portfolio.id),
    ExceptionReviewModel.findAll({
      where: { portfolioId: portfolio.id, exclusionStatus: "approved" },
      attributes: ["businessDate"],
    }),
  ]);
  const holidaySet = new Set(holidays.map((h) => h.date));
  return {
    portfolio,
    entity,
    holidays: holidaySet,
    // FRTB: a business day never reported counts as an exception (MAR32.5(2)), so it must be in the window.
    series: getRegime(entity.regime).missingCountsAsException ? withMissingBusinessDays(series, holidaySet) : series,
    excludedDates: new Set(approved.map((r) => r.businessDate)),
  };
}
