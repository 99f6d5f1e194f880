import { sequelize } from "../../db/sequelize";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { SnapshotModel } from "../../models/snapshot";
import { recordAudit } from "../audit/audit.service";
import { returnData, returnInputsFor } from "../../../shared/backtest/return-data";
import type { ReturnInputsBody, Snapshot, SnapshotFigures, SnapshotReturn } from "../../../shared/schemas/snapshot";
import { snapshotDto, visibleSnapshotRow } from "./snapshots.read";
import type { SignedIn } from "../../kit/actor";
import { checkVersion } from "../../kit/stale";
import { getRegime } from "../../../shared/backtest/regimes";
import { recomputeAmendment } from "./snapshots.amendments";

/**
 * The return data of a snapshot (docs/rules.md#return-data), read from its frozen figures and the
 * analyst's inputs sealed with them: the same answer for as long as the snapshot exists. This is
 * the one list of fields every reader of the return takes (the JSON, the pack, any download).
 */
export async function getSnapshotReturn(id: number, actor: SignedIn): Promise<SnapshotReturn> {
  const row = await visibleSnapshotRow(id, actor);
  return returnData(JSON.parse(row.figuresJson) as SnapshotFigures, row.quarterEnd);
}

/**
 * The analyst enters the values of the return the product does not hold, on a draft or returned
 * snapshot: they are sealed with the figures when the CRO approves, and never change after. A
 * value left empty (null) stays "not entered"; a key the entity's rule set does not ask for is refused.
 */
export async function setReturnInputs(id: number, body: ReturnInputsBody, actor: SignedIn): Promise<Snapshot> {
  return sequelize.transaction(async (transaction) => {
    const row = await SnapshotModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError(`No snapshot #${id}.`);
    await checkVersion(row.version, body.version, async () => ({
      message: `Snapshot #${id} changed since you opened it (now version ${row.version}). Look at it again before entering values.`,
      current: await snapshotDto(row),
    }));
    if (row.status !== "draft" && row.status !== "returned")
      throw new ConflictError(
        `Snapshot #${id} is ${row.status}: its return values are frozen. Only a draft or returned snapshot takes new values.`,
      );
    const figures = JSON.parse(row.figuresJson) as SnapshotFigures;
    const asked = new Set(returnInputsFor(figures).map((d) => d.key));
    const unknown = Object.keys(body.values).filter((k) => !asked.has(k));
    if (unknown.length) {
      throw new AppError(
        422,
        "validation_failed",
        `The request is not valid. ${getRegime(figures.regime).label} does not ask for ${unknown.join(", ")}; it asks for ${asked.size ? [...asked].join(", ") : "none"}.`,
        {
          fields: Object.fromEntries(
            unknown.map((k) => [`values.${k}`, "Not a value this rule set's return asks for"]),
          ),
        },
      );
    }
    const before = figures.analystInputs ?? {};
    const after = { ...before, ...body.values };
    const changed: SnapshotFigures = { ...figures, analystInputs: after };
    await row.update(
      {
        figuresJson: JSON.stringify(changed),
        // An amendment's before/after follows its figures (computed at write time, docs/api.md#amendments).
        amendmentJson: await recomputeAmendment(row, changed, transaction),
        version: row.version + 1,
      },
      { transaction },
    );
    await recordAudit(actor, "snapshot.return-inputs", `snapshot #${id}`, { before, after }, transaction);
    return snapshotDto(row);
  });
}
