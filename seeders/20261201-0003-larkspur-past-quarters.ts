/**
 * The four most recent ended quarters of every Larkspur entity, signed off the way the office
 * does it: the analyst explains what the data-quality checks found inside the quarter, prepares
 * and submits the snapshot, and the CRO approves it (oldest first, so each entity's hash chain
 * runs in order). The current quarter stays open. Invented data, invented people.
 */
import { Op } from "sequelize";
import { AppError } from "../server/errors";
import { DataFindingModel } from "../server/models/data-finding";
import { EntityModel } from "../server/models/entity";
import { PortfolioModel } from "../server/models/portfolio";
import { closeFinding } from "../server/modules/findings/findings.service";
import { approveSnapshot, prepareSnapshot, submitSnapshot } from "../server/modules/snapshots/snapshots.service";
import { endedQuarterEnds, quarterLabel, quarterStart } from "../shared/backtest/quarters";
import { demoActor } from "./demo/actor";

const QUARTERS = 4;

export async function up(): Promise<void> {
  const analyst = await demoActor("analyst@larkspur.test");
  const cro = await demoActor("cro@larkspur.test");
  const quarters = endedQuarterEnds(new Date().toISOString().slice(0, 10), QUARTERS).reverse();
  for (const entity of await EntityModel.findAll({ order: [["code", "ASC"]] })) {
    const portfolioIds = (await PortfolioModel.findAll({ where: { entityId: entity.id } })).map((p) => p.id);
    for (const quarterEnd of quarters) {
      const open = await DataFindingModel.findAll({
        where: {
          portfolioId: portfolioIds,
          status: "open",
          dateFrom: { [Op.lte]: quarterEnd },
          dateTo: { [Op.gte]: quarterStart(quarterEnd) },
        },
      });
      for (const finding of open) {
        const note = `Checked with the desk at the ${quarterLabel(quarterEnd)} close: the figures are right (demo).`;
        await closeFinding(finding.id, { status: "explained", note, version: finding.version }, analyst);
      }
      let snapshot;
      try {
        ({ snapshot } = await prepareSnapshot({ entity: entity.code, quarterEnd }, analyst));
      } catch (err) {
        // The demo's gap day can fall on a quarter's last day, depending on the date the seed runs.
        if (err instanceof AppError && err.status === 422) {
          console.log(`[seed] ${entity.code} ${quarterLabel(quarterEnd)} left open: ${err.message}`);
          continue;
        }
        throw err;
      }
      const submitted = await submitSnapshot(
        snapshot.id,
        { comment: "Figures and findings reviewed.", version: snapshot.version },
        analyst,
      );
      await approveSnapshot(
        submitted.id,
        { comment: `${quarterLabel(quarterEnd)} signed off.`, version: submitted.version },
        cro,
      );
    }
  }
}
