import { Op, type Transaction, type WhereOptions } from "sequelize";
import { AuditEventModel } from "../../models/audit-event";
import { sign } from "../snapshot-chain/signing";
import { auditEventText, sealAfterCommit, sealAuditLog } from "./audit-chain";
import { currentTransaction } from "../../db/transaction-context";
import type { Actor } from "../../kit/actor";
import type { AuditEvent, AuditQuery } from "../../../shared/schemas/audit";

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
    action: row.action,
    target: row.target,
    ip: row.ip,
    before: row.beforeJson ? JSON.parse(row.beforeJson) : null,
    after: row.afterJson ? JSON.parse(row.afterJson) : null,
  };
}

export { verifyAuditLog } from "./audit-chain";

export async function listAuditEvents(query: AuditQuery): Promise<{ items: AuditEvent[]; total: number }> {
  const where: WhereOptions = query.action
    ? { action: { [Op.like]: `${query.action.replace(/[%_\\]/g, "\\$&")}%` } }
    : {};
  const { rows, count } = await AuditEventModel.findAndCountAll({
    where,
    order: [["id", "DESC"]],
    limit: query.limit,
    offset: query.offset,
  });
  return { items: rows.map(toAuditEvent), total: count };
}
