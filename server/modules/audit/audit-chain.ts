import { Op, QueryTypes, Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { logger } from "../../logger";
import { AuditEventModel } from "../../models/audit-event";
import { canonical, KEY_ID, sign, signatureMatches } from "../snapshot-chain/signing";
import type { AuditVerify } from "../../../shared/schemas/audit";

/**
 * The audit log as a signed, append-only chain. Each event is signed when it is written (its
 * content: when, who, what, on which target, from where, before and after). Right after the
 * writing transaction commits, the sealer gives committed events their place in the chain — seq
 * 1, 2, … in commit order — and a link signature over (seq, id, the event's signature, the previous
 * link's signature); a signed head names the newest. An edited event, a deleted one and a deleted
 * newest one all show in `verifyAuditLog()`; none of it can be recomputed without the chain key.
 */

export type AuditContent = Pick<
  AuditEventModel,
  "at" | "actorUserId" | "actorEmail" | "action" | "target" | "ip" | "requestId" | "beforeJson" | "afterJson"
>;

export const auditEventText = (e: AuditContent) =>
  canonical({
    at: e.at.toISOString(),
    actorUserId: e.actorUserId === null ? null : Number(e.actorUserId),
    actorEmail: e.actorEmail,
    action: e.action,
    target: e.target,
    ip: e.ip,
    requestId: e.requestId,
    before: e.beforeJson,
    after: e.afterJson,
  });

export const auditLinkText = (seq: number, id: number, mac: string, prev: string | null) =>
  canonical({ seq, id, mac, prev });
export const auditHeadText = (seq: number, chainMac: string | null) => canonical({ key: KEY_ID, seq, chainMac });

interface Head {
  seq: number;
  chain_mac: string | null;
  head_mac: string | null;
}

async function readHead(transaction: Transaction, lock: boolean): Promise<Head | null> {
  const [head] = await sequelize.query<Head>(
    `SELECT seq, chain_mac, head_mac FROM audit_chain_head WHERE id = 1${lock ? " FOR UPDATE" : ""}`,
    { transaction, type: QueryTypes.SELECT },
  );
  return head ? { ...head, seq: Number(head.seq) } : null;
}

/**
 * Chains every committed, correctly signed event that has no place yet (the head row is locked, so
 * sealers take turns). An event whose signature does not hold is left out, for verify to report.
 */
export async function sealAuditLog(): Promise<number> {
  return sequelize.transaction(async (transaction) => {
    const head = await readHead(transaction, true);
    if (!head) return 0; // before the migration that makes the head
    let { seq } = head;
    let prev = head.chain_mac;
    let sealed = 0;
    for (let after = 0; ;) {
      const pending = await AuditEventModel.findAll({
        where: { seq: { [Op.is]: null }, id: { [Op.gt]: after } },
        order: [["id", "ASC"]],
        limit: 500,
        transaction,
      });
      if (pending.length === 0) break;
      after = Number(pending[pending.length - 1].id);
      const signed = pending.filter((e) => signatureMatches("audit-event", auditEventText(e), e.mac));
      // A copy of an event already in the chain (its signature replayed) is not a new event.
      const copies = new Set(
        (
          await AuditEventModel.findAll({
            where: { mac: signed.map((e) => e.mac!), seq: { [Op.not]: null } },
            attributes: ["mac"],
            transaction,
          })
        ).map((e) => e.mac),
      );
      for (const e of signed) {
        if (copies.has(e.mac)) continue;
        copies.add(e.mac);
        seq++;
        const chainMac = sign("audit-link", auditLinkText(seq, Number(e.id), e.mac!, prev));
        await e.update({ seq, chainMac }, { transaction });
        prev = chainMac;
        sealed++;
      }
    }
    if (sealed)
      await sequelize.query("UPDATE audit_chain_head SET seq = :seq, chain_mac = :prev, head_mac = :mac WHERE id = 1", {
        transaction,
        replacements: { seq, prev, mac: sign("audit-head", auditHeadText(seq, prev)) },
      });
    return sealed;
  });
}

/** Seals after the transaction that wrote events commits (once per transaction); a failure is logged, the next seal catches up. */
const sealsAfterCommit = new WeakSet<Transaction>();
export function sealAfterCommit(transaction: Transaction): void {
  if (sealsAfterCommit.has(transaction)) return;
  sealsAfterCommit.add(transaction);
  transaction.afterCommit(async () => {
    await sealAuditLog().catch((err: Error) => logger.error(`audit log sealing failed: ${err.message}`));
  });
}

const BATCH = 2000;

/** GET /api/audit-events/verify: every signed event from the first to the signed head, in one consistent read. */
export async function verifyAuditLog(): Promise<AuditVerify> {
  await sealAuditLog();
  const problems: AuditVerify["problems"] = [];
  // One consistent view of the head and the events (REPEATABLE READ), however transactions are set by default.
  const events = await sequelize.transaction(
    { isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ },
    async (transaction) => {
      const head = await readHead(transaction, false);
      let expected = 1;
      let prev: string | null = null;
      let last: { seq: number; chainMac: string | null; id: number } | null = null;
      const describe = (e: AuditEventModel) =>
        `Event #${e.id} (seq ${e.seq}, ${e.action}${e.target ? ` on ${e.target}` : ""})`;
      for (let from = 0; ;) {
        const rows = await AuditEventModel.findAll({
          where: { seq: { [Op.gt]: from } },
          order: [["seq", "ASC"]],
          limit: BATCH,
          transaction,
        });
        for (const e of rows) {
          const seq = Number(e.seq);
          const id = Number(e.id);
          if (seq > expected)
            problems.push({
              eventId: id,
              seq: expected,
              detail: `${seq - expected === 1 ? `The event with seq ${expected} is` : `Events with seq ${expected}–${seq - 1} are`} missing before event #${id}: deleted.`,
            });
          if (!signatureMatches("audit-event", auditEventText(e), e.mac))
            problems.push({
              eventId: id,
              seq,
              detail: `${describe(e)} was altered after it was written: its content no longer matches its signature.`,
            });
          else if (!signatureMatches("audit-link", auditLinkText(seq, id, e.mac!, prev), e.chainMac))
            problems.push({
              eventId: id,
              seq,
              detail: `${describe(e)} does not link to the event before it: an event was removed, replaced or renumbered.`,
            });
          prev = e.chainMac;
          expected = seq + 1;
          last = { seq, chainMac: e.chainMac, id };
        }
        if (rows.length < BATCH) break;
        from = Number(rows[rows.length - 1].seq);
      }
      if (!head) {
        problems.push({ eventId: null, seq: null, detail: "The audit log has no signed head." });
      } else if (!signatureMatches("audit-head", auditHeadText(head.seq, head.chain_mac), head.head_mac)) {
        problems.push({
          eventId: null,
          seq: null,
          detail: "The audit log's head does not carry a valid signature: it was altered.",
        });
      } else if (head.seq > (last?.seq ?? 0)) {
        const missing = head.seq - (last?.seq ?? 0);
        problems.push({
          eventId: null,
          seq: head.seq,
          detail: `The signed head counts ${head.seq} events but the newest remaining is seq ${last?.seq ?? 0}: the newest ${missing === 1 ? "event was" : `${missing} events were`} deleted.`,
        });
      } else if (last && (head.seq !== last.seq || head.chain_mac !== last.chainMac)) {
        problems.push({
          eventId: last.id,
          seq: last.seq,
          detail: `The signed head names seq ${head.seq}, not the newest event (seq ${last.seq}): events were added without the key.`,
        });
      }
      // Unsealed events: one with a good signature may be waiting for its sealer (committed a moment
      // ago); one without, or a copy of a sealed event, was not written by Quartermark.
      const unsealed = await AuditEventModel.findAll({
        where: { seq: { [Op.is]: null } },
        order: [["id", "ASC"]],
        transaction,
      });
      const sealedMacs = new Set(
        (
          await AuditEventModel.findAll({
            where: { mac: unsealed.map((e) => e.mac ?? ""), seq: { [Op.not]: null } },
            attributes: ["mac"],
            transaction,
          })
        ).map((e) => e.mac),
      );
      for (const e of unsealed) {
        const copy = sealedMacs.has(e.mac);
        if (!copy && signatureMatches("audit-event", auditEventText(e), e.mac)) continue;
        problems.push({
          eventId: Number(e.id),
          seq: null,
          detail: copy
            ? `Event #${e.id} (${e.action}) is a copy of an event already in the log: it was not written by Quartermark.`
            : `Event #${e.id} (${e.action}) carries no valid signature: it was not written by Quartermark, or was altered before it was sealed.`,
        });
      }
      return last?.seq ?? 0;
    },
  );
  const detail = problems.length
    ? `${problems[0].detail}${problems.length > 1 ? ` (and ${problems.length - 1} more problem${problems.length > 2 ? "s" : ""})` : ""}`
    : `All ${events} events carry the server's signature, follow each other without a gap and end at the signed head.`;
  return { valid: problems.length === 0, events, problems, detail };
}
