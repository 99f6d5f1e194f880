import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "./sequelize";

/**
 * Locks portfolio rows in the caller's transaction, always by primary key and in id order: the
 * one way every writer and sign-off takes them (upload commits and exception reviews for update,
 * approvals for share). A shared locking read answered from a secondary index alone locks only
 * that index's entries, which a lock on the rows never meets, so no lock here goes through one
 * (tests/server/snapshot-faults.test.ts). Returns the ids that exist and are now held.
 */
export async function lockPortfolios(
  ids: readonly number[],
  mode: "update" | "share",
  transaction: Transaction,
): Promise<Set<number>> {
  const held = new Set<number>();
  if (ids.length === 0) return held;
  const rows = await sequelize.query<{ id: number }>(
    `SELECT id FROM portfolios WHERE id IN (:ids) ORDER BY id ${mode === "update" ? "FOR UPDATE" : "LOCK IN SHARE MODE"}`,
    {
      replacements: { ids: [...ids] },
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  for (const r of rows) held.add(Number(r.id));
  return held;
}

/**
 * Locks every portfolio of an entity for update (by primary key, in id order): the writers whose
 * change refreshes the entity's stored figures take all of its books first, so two of them never
 * hold part each and wait for the rest.
 */
export async function lockEntityPortfolios(entityId: number, transaction: Transaction): Promise<number[]> {
  const ids = await sequelize.query<{ id: number }>("SELECT id FROM portfolios WHERE entity_id = :entityId", {
    replacements: { entityId },
    type: QueryTypes.SELECT,
    transaction,
  });
  return [
    ...(await lockPortfolios(
      ids.map((r) => Number(r.id)),
      "update",
      transaction,
    )),
  ].sort((a, b) => a - b);
}
