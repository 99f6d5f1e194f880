/**
 * Each portfolio of an entity with what `portfolio_figures` holds for it (parsed) beside a fresh
 * computation from the data as it now is: the comparison behind the stored-figures property test
 * and the demo-seed check.
 */
import { QueryTypes } from "sequelize";
import { sequelize } from "../../../server/db/sequelize";
import { entityWithPortfolios } from "../../../server/modules/figures/engine-inputs";
import { computePortfolioFigures, type PortfolioFigures } from "../../../server/modules/figures/stored-figures";
import type { PortfolioModel } from "../../../server/models/portfolio";

/** The parts a stored row holds, as JSON gives them back. */
export type StoredParts = { [K in keyof PortfolioFigures]: unknown };

export async function storedAndFresh(
  entityId: number,
): Promise<{ portfolio: PortfolioModel; stored: StoredParts | undefined; fresh: StoredParts }[]> {
  const { entity, portfolios } = await entityWithPortfolios(entityId);
  const out = [];
  for (const portfolio of portfolios) {
    const fresh = JSON.parse(JSON.stringify(await computePortfolioFigures(portfolio, entity, portfolios)));
    const [row] = await sequelize.query<{
      as_of: string | null;
      backtest_json: string | null;
      rolling_json: string;
      overview_json: string | null;
      start_json: string | null;
    }>(
      `SELECT DATE_FORMAT(as_of, '%Y-%m-%d') AS as_of, backtest_json, rolling_json, overview_json, start_json
         FROM portfolio_figures WHERE portfolio_id = :id`,
      { replacements: { id: portfolio.id }, type: QueryTypes.SELECT },
    );
    const parse = (s: string | null) => (s === null ? null : JSON.parse(s));
    const stored = row && {
      asOf: row.as_of,
      backtest: parse(row.backtest_json),
      rolling: parse(row.rolling_json),
      overview: parse(row.overview_json),
      start: parse(row.start_json),
    };
    out.push({ portfolio, stored, fresh });
  }
  return out;
}
