/**
 * The one-time signing of what was signed off before the chain was keyed, run by the migrations
 * 20261202-15-01 and -02 (never at start-up: a routine that signed whatever the database holds
 * whenever it finds it unsigned would sign a forgery too). It trusts the rows as they stand when
 * it runs, once. Only the columns it names are read, so later migrations that add columns do not
 * break it.
 */
import { Op, QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { AuditEventModel } from "../../models/audit-event";
import { FilingModel } from "../../models/filing";
import { SNAPSHOT_HEADLINE_COLUMNS, SnapshotModel } from "../../models/snapshot";
import { UserModel } from "../../models/user";
import { auditEventText, auditHeadText, auditLinkText } from "../audit/audit-chain";
import { appendLink, type SnapshotFields } from "./snapshot-chain";
import { sign } from "./signing";

const SNAPSHOT_FIELDS: (keyof SnapshotFields)[] = [
  "id",
  "entityId",
  "quarterEnd",
  "status",
  ...SNAPSHOT_HEADLINE_COLUMNS,
  "windowStart",
  "asOf",
  "figuresJson",
  "inputsSha256",
  "engineVersion",
  "preparedBy",
  "preparedAt",
  "submittedBy",
  "submittedAt",
  "approvedBy",
  "approvedAt",
  "historyJson",
  "hash",
  "prevHash",
  "restatedAt",
  "restatementDetail",
];

/** Every entity's signed-off snapshots, in the order they were approved, then their filings and acknowledgements. */
export async function backfillSnapshotChains(): Promise<number> {
  const sealed = await SnapshotModel.findAll({
    attributes: SNAPSHOT_FIELDS,
    where: { [Op.or]: [{ hash: { [Op.not]: null } }, { status: ["approved", "filed"] }] },
    order: [
      ["entityId", "ASC"],
      ["approvedAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  const filings = await FilingModel.findAll({
    attributes: ["id", "snapshotId", "packSha256", "messageId", "delivery", "acknowledgedBy"],
    where: { delivery: "sent" },
    order: [["id", "ASC"]],
  });
  const emails = new Map(
    (await UserModel.findAll({ attributes: ["id", "email"] })).map((u) => [u.id, u.email] as const),
  );
  let links = 0;
  await sequelize.transaction(async (transaction) => {
    for (const s of sealed) {
      await appendLink(s, "backfilled", transaction);
      links++;
    }
    const byId = new Map(sealed.map((s) => [s.id, s]));
    for (const f of filings) {
      const s = byId.get(f.snapshotId);
      if (!s) continue;
      await appendLink(s, "filed", transaction, {
        filingId: f.id,
        packSha256: f.packSha256,
        messageId: f.messageId,
      });
      links++;
      if (f.acknowledgedBy) {
        await appendLink(s, "acknowledged", transaction, {
          filingId: f.id,
          packSha256: f.packSha256,
          by: emails.get(f.acknowledgedBy) ?? `user #${f.acknowledgedBy}`,
        });
        links++;
      }
    }
  });
  return links;
}

const AUDIT_FIELDS = [
  "id",
  "at",
  "actorUserId",
  "actorEmail",
  "action",
  "target",
  "ip",
  "requestId",
  "beforeJson",
  "afterJson",
] as const;

/** Signs and chains the audit events written before the log was signed, in id order, and writes the signed head. */
export async function backfillAuditChain(): Promise<number> {
  let seq = 0;
  let prev: string | null = null;
  await sequelize.transaction(async (transaction) => {
    for (let after = 0; ;) {
      const rows = await AuditEventModel.findAll({
        attributes: [...AUDIT_FIELDS],
        where: { id: { [Op.gt]: after } },
        order: [["id", "ASC"]],
        limit: 2000,
        transaction,
      });
      for (const e of rows) {
        seq++;
        const mac = sign("audit-event", auditEventText(e));
        const chainMac = sign("audit-link", auditLinkText(seq, Number(e.id), mac, prev));
        await sequelize.query("UPDATE audit_events SET mac = :mac, seq = :seq, chain_mac = :chainMac WHERE id = :id", {
          transaction,
          replacements: { mac, seq, chainMac, id: e.id },
        });
        prev = chainMac;
      }
      if (rows.length < 2000) break;
      after = Number(rows[rows.length - 1].id);
    }
    await sequelize.query("INSERT INTO audit_chain_head (id, seq, chain_mac, head_mac) VALUES (1, :seq, :prev, :mac)", {
      transaction,
      type: QueryTypes.INSERT,
      replacements: { seq, prev, mac: sign("audit-head", auditHeadText(seq, prev)) },
    });
  });
  return seq;
}
