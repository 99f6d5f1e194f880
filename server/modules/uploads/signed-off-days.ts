import type { Transaction } from "sequelize";
import { EntityModel } from "../../models/entity";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { quarterEndOf } from "../../../shared/backtest/quarters";
import { SIGNED_OFF } from "../../../shared/schemas/snapshot";
import type { SignedOffQuarter } from "../../../shared/schemas/upload";

// Which restated days lie in a quarter already signed off (approved or filed): the preview warns of them and the
// commit asks for an explicit confirmation. The snapshots keep their figures either way (snapshots.restatements.ts
// flags them restated in the commit's transaction).

export interface SignedOffDays {
  /** The signed-off quarter a day of this portfolio lies in, or null. */
  quarterOf: (portfolioId: number, date: string) => SignedOffQuarter | null;
  /** How many of the days lie in one, and each such quarter with its count of days. */
  count: number;
  quarters: (SignedOffQuarter & { days: number })[];
}

export async function signedOffDays(
  days: readonly { portfolioId: number; date: string }[],
  transaction?: Transaction,
): Promise<SignedOffDays> {
  const none: SignedOffDays = { quarterOf: () => null, count: 0, quarters: [] };
  if (days.length === 0) return none;
  const portfolios = await PortfolioModel.findAll({
    where: { id: [...new Set(days.map((d) => d.portfolioId))] },
    attributes: ["id", "entityId"],
    transaction,
  });
  const entityOf = new Map(portfolios.map((p) => [p.id, p.entityId]));
  const entityIds = [...new Set(portfolios.map((p) => p.entityId))];
  const [snapshots, entities] = await Promise.all([
    SnapshotModel.findAll({
      where: { entityId: entityIds, status: [...SIGNED_OFF] },
      attributes: ["entityId", "quarterEnd", "status"],
      transaction,
    }),
    EntityModel.findAll({ where: { id: entityIds }, attributes: ["id", "code"], transaction }),
  ]);
  if (snapshots.length === 0) return none;
  const codeOf = new Map(entities.map((e) => [e.id, e.code]));
  // Filed outranks approved: an amendment may be approved while the quarter's first snapshot stands filed.
  const byQuarter = new Map<string, SignedOffQuarter>();
  for (const s of snapshots) {
    const key = `${s.entityId}|${s.quarterEnd}`;
    if (byQuarter.get(key)?.status === "filed") continue;
    byQuarter.set(key, {
      entity: codeOf.get(s.entityId) ?? "",
      quarterEnd: s.quarterEnd,
      status: s.status as SignedOffQuarter["status"],
    });
  }
  const quarterOf = (portfolioId: number, date: string) =>
    byQuarter.get(`${entityOf.get(portfolioId)}|${quarterEndOf(date)}`) ?? null;
  const counted = new Map<SignedOffQuarter, number>();
  let count = 0;
  for (const d of days) {
    const q = quarterOf(d.portfolioId, d.date);
    if (!q) continue;
    count++;
    counted.set(q, (counted.get(q) ?? 0) + 1);
  }
  const quarters = [...counted.entries()]
    .map(([q, n]) => ({ ...q, days: n }))
    .sort((a, b) => a.entity.localeCompare(b.entity) || a.quarterEnd.localeCompare(b.quarterEnd));
  return { quarterOf, count, quarters };
}
