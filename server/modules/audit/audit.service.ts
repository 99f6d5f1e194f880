import { Op, type Transaction, type WhereOptions } from "sequelize";
import { AuditEventModel } from "../../models/audit-event";
import { sign } from "../snapshot-chain/signing";
import { auditEventText, sealAfterCommit, sealAuditLog } from "./audit-chain";
import { currentTransaction } from "../../db/transaction-context";
import type { Actor } from "../../kit/actor";
import { AUDIT_EXPORT_MAX, type AuditEvent, type AuditFilter, type AuditQuery } from "../../../shared/schemas/audit";
import { AppError } from "../../errors";
import { auditWords } from "./audit-targets";

/**
 * Writes one audit event — who, what, on which target, from where, before and after — signed with
 * the chain key, and chains it once the transaction commits (audit-chain.ts). Events are only ever
 * added: nothing in the application updates or deletes them.
 */
export async function recordAudit(
  actor: Actor,
  action: string,
  target: string | null,
  change: { before?: unknown; after?: unknown } = {},
  transaction?: Transaction,
): Promise<void> {
  const content = {
    at: new Date(), // milliseconds, as DATETIME(3) keeps them: the signature is checked against the stored value
    actorUserId: actor.user?.id ?? null,
    actorEmail: actor.user?.email ?? null,
    action,
    target: target ? target.slice(0, 190) : null,
    ip: actor.ip,
    requestId: actor.requestId,
    beforeJson: change.before === undefined ? null : JSON.stringify(change.before),
    afterJson: change.after === undefined ? null : JSON.stringify(change.after),
  };
  // In a transaction (given, or the one the call runs in), the event is chained once it commits.
  const inside = transaction ?? currentTransaction();
  await AuditEventModel.create(
    { ...content, mac: sign("audit-event", auditEventText(content)) },
    { transaction: inside ?? undefined },
  );
  if (inside) sealAfterCommit(inside);
  else await sealAuditLog();
}

function toAuditEvent(row: AuditEventModel): AuditEvent {
  return {
    id: Number(row.id),
    at: row.at.toISOString(),
    actorEmail: row.actorEmail,
    actorName: null,
    action: row.action,
    target: row.target,
    targetWords: null,
    ip: row.ip,
    before: row.beforeJson ? JSON.parse(row.beforeJson) : null,
    after: row.afterJson ? JSON.parse(row.afterJson) : null,
  };
}

export { verifyAuditLog } from "./audit-chain";

const likeText = (text: string) => text.replace(/[%_\\]/g, "\\$&");

function auditWhere(filter: AuditFilter): WhereOptions {
  const where: Record<string | symbol, unknown> = {};
  if (filter.action) where.action = { [Op.like]: `${likeText(filter.action)}%` };
  if (filter.actor) where.actorEmail = { [Op.like]: `%${likeText(filter.actor)}%` };
  if (filter.from || filter.to)
    where.at = {
      ...(filter.from ? { [Op.gte]: new Date(`${filter.from}T00:00:00Z`) } : {}),
      ...(filter.to ? { [Op.lt]: new Date(Date.parse(`${filter.to}T00:00:00Z`) + 86_400_000) } : {}),
    };
  return where;
}

/** Every event the filter selects, newest first, for an export; refused when there are too many. */
export async function auditEventsForExport(filter: AuditFilter): Promise<AuditEvent[]> {
  const where = auditWhere(filter);
  const total = await AuditEventModel.count({ where });
  if (total > AUDIT_EXPORT_MAX)
    throw new AppError(
      422,
      "validation_failed",
      `The audit log holds ${total.toLocaleString("en-GB")} events for this filter; an export takes at most ` +
        `${AUDIT_EXPORT_MAX.toLocaleString("en-GB")}. Narrow it by days, person or action.`,
      { fields: { from: "Narrow the span of days" } },
    );
  const rows = await AuditEventModel.findAll({ where, order: [["id", "DESC"]] });
  return rows.map(toAuditEvent);
}

export async function listAuditEvents(query: AuditQuery): Promise<{ items: AuditEvent[]; total: number }> {
  const where = auditWhere(query);
  const { rows, count } = await AuditEventModel.findAndCountAll({
    where,
    order: [["id", "DESC"]],
    limit: query.limit,
    offset: query.offset,
  });
  const items = rows.map(toAuditEvent);
  const { targets, names } = await auditWords(items);
  return {
    items: items.map((e) => ({
      ...e,
      actorName: e.actorEmail ? (names.get(e.actorEmail) ?? null) : null,
      targetWords: e.target ? (targets.get(e.target) ?? null) : null,
    })),
    total: count,
  };
}
