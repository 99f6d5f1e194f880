import { createHash } from "node:crypto";
import stableStringify from "fast-json-stable-stringify";
import { Op, type Transaction } from "sequelize";
import { EntityModel } from "../../models/entity";
import { SnapshotModel } from "../../models/snapshot";
import type { SnapshotVerify } from "../../../shared/schemas/snapshot";
import { visibleSnapshotRow } from "./snapshots.read";
import type { SignedIn } from "../../kit/actor";

/** What the hash of a signed-off snapshot covers, in a canonical form. */
export function hashedContent(row: SnapshotModel, entity: EntityModel) {
  return stableStringify({
    entity: entity.code,
    quarterEnd: row.quarterEnd,
    figures: row.figuresJson,
    // The headline columns that lists, the capital history and filings read, as stored.
    zone: row.zone,
    counted: row.counted,
    plusFactor: row.plusFactor,
    multiplier: row.multiplier,
    capital: row.capital,
    addOn: row.addOn,
    windowStart: row.windowStart,
    asOf: row.asOf,
    inputsSha256: row.inputsSha256,
    engineVersion: row.engineVersion,
    preparedBy: row.preparedBy,
    preparedAt: row.preparedAt.toISOString(),
    submittedBy: row.submittedBy,
    approvedBy: row.approvedBy,
    approvedAt: row.approvedAt?.toISOString() ?? null,
    prevHash: row.prevHash,
  });
}
export const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");

/**
 * The entity's signed-off snapshots in the order they were approved: the hash chain. Inside an
 * approval it is a locking read, so it sees an approval that committed while this one waited.
 */
export async function chainOf(entityId: number, transaction?: Transaction): Promise<SnapshotModel[]> {
  return SnapshotModel.findAll({
    where: { entityId, hash: { [Op.ne]: null } },
    order: [
      ["approvedAt", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
    ...(transaction ? { lock: transaction.LOCK.SHARE } : {}),
  });
}

/** Recomputes the snapshot's hash from what is stored and checks its link to the one approved before it. */
export async function verifySnapshot(id: number, actor: SignedIn): Promise<SnapshotVerify> {
  const row = await visibleSnapshotRow(id, actor);
  if (!row.hash)
    return { valid: false, hash: null, prevHash: null, detail: "Not signed off yet: there is no hash to verify." };
  const entity = (await EntityModel.findByPk(row.entityId))!;
  const recomputed = sha256(hashedContent(row, entity));
  if (recomputed !== row.hash) {
    return {
      valid: false,
      hash: row.hash,
      prevHash: row.prevHash,
      detail: `The stored content no longer gives the stored hash (it gives ${recomputed.slice(0, 12)}…): the snapshot was altered after approval.`,
    };
  }
  const chain = await chainOf(row.entityId);
  const at = chain.findIndex((s) => s.id === row.id);
  const expectedPrev = at > 0 ? chain[at - 1].hash : null;
  if (row.prevHash !== expectedPrev) {
    return {
      valid: false,
      hash: row.hash,
      prevHash: row.prevHash,
      detail: "The link to the previously approved snapshot does not match: the chain was altered.",
    };
  }
  return {
    valid: true,
    hash: row.hash,
    prevHash: row.prevHash,
    detail: `The hash matches the stored figures and inputs, and links to ${expectedPrev ? "the snapshot approved before it" : "nothing before it (the first approved snapshot of the entity)"}.`,
  };
}
