import type { Model, ModelStatic, Transaction, WhereOptions } from "sequelize";
import { NotFoundError } from "../errors";
import { EntityModel } from "../models/entity";
import { UserModel } from "../models/user";

/** The entity with this code, or 404 "No entity with code …". */
export async function entityByCode(
  code: string,
  options: { transaction?: Transaction; lock?: boolean } = {},
): Promise<EntityModel> {
  const { transaction, lock } = options;
  const row = await EntityModel.findOne({
    where: { code },
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!row) throw new NotFoundError(`No entity with code ${code}.`);
  return row;
}

/** The one row `where` finds, locked for update in `transaction` (null when there is none). */
export async function findLocked<M extends Model>(
  model: ModelStatic<M>,
  where: WhereOptions<M["_attributes"]>,
  transaction: Transaction,
): Promise<M | null> {
  return model.findOne({ where, transaction, lock: transaction.LOCK.UPDATE });
}

/** The one row `where` finds, locked for update in `transaction`; 404 with `missing` when there is none. */
export async function lockedRow<M extends Model>(
  model: ModelStatic<M>,
  where: WhereOptions<M["_attributes"]>,
  transaction: Transaction,
  missing: string,
): Promise<M> {
  const row = await findLocked(model, where, transaction);
  if (!row) throw new NotFoundError(missing);
  return row;
}

/** The e-mail of each of these people, read once (ids that are null or repeated are skipped). */
export async function emailsById(ids: Iterable<number | null | undefined>): Promise<Map<number, string>> {
  const wanted = [...new Set([...ids].filter((v): v is number => typeof v === "number"))];
  if (wanted.length === 0) return new Map();
  const rows = await UserModel.findAll({ where: { id: wanted }, attributes: ["id", "email"] });
  return new Map(rows.map((u) => [u.id, u.email]));
}

/** Each entity's reporting currency by code (the tables that list several entities show it per row). */
export async function currenciesByEntity(): Promise<Map<string, string>> {
  const rows = await EntityModel.findAll({ attributes: ["code", "currency"] });
  return new Map(rows.map((e) => [e.code, e.currency]));
}
