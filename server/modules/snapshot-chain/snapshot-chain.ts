import { Transaction } from "sequelize";
import { ChainHeadModel, ChainLinkModel, type ChainLinkKind } from "../../models/snapshot-chain";
import { sequelize } from "../../db/sequelize";
import { currentTransaction } from "../../db/transaction-context";
import { SnapshotModel } from "../../models/snapshot";
import { quarterLabel } from "../../../shared/backtest/quarters";
import type { ChainProblem } from "../../../shared/schemas/snapshot";
import { canonical, KEY_ID, sha256, sign, signatureMatches } from "./signing";

/**
 * The signed snapshot chain of an entity. Every event that changes a signed-off snapshot — its
 * approval (sealed), filing, a restatement flag, the supervisor's acknowledgement — appends a link
 * that holds the snapshot's whole state after the event, numbered (seq 1, 2, …), linked to the link
 * before it and signed with the chain key (HMAC-SHA256, signing.ts). A signed head per entity names
 * the newest link, so a deleted newest link shows as well as a deleted or edited one in between.
 */

/** The snapshot fields the chain covers (everything that matters; not the row version or timestamps). */
export type SnapshotFields = Pick<
  SnapshotModel,
  | "id"
  | "entityId"
  | "quarterEnd"
  | "status"
  | "zone"
  | "counted"
  | "plusFactor"
  | "multiplier"
  | "capital"
  | "addOn"
  | "windowStart"
  | "asOf"
  | "figuresJson"
  | "inputsSha256"
  | "engineVersion"
  | "preparedBy"
  | "preparedAt"
  | "submittedBy"
  | "submittedAt"
  | "approvedBy"
  | "approvedAt"
  | "historyJson"
  | "hash"
  | "prevHash"
  | "restatedAt"
  | "restatementDetail"
  | "amendsId"
  | "amendmentJson"
>;

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** The state a link signs: every field that matters, the long texts as their sha256. */
export function snapshotState(s: SnapshotFields) {
  return {
    snapshotId: s.id,
    entityId: s.entityId,
    quarterEnd: s.quarterEnd,
    status: s.status,
    zone: s.zone,
    counted: s.counted,
    plusFactor: s.plusFactor,
    multiplier: s.multiplier,
    capital: s.capital,
    addOn: s.addOn,
    windowStart: s.windowStart,
    asOf: s.asOf,
    figuresSha256: sha256(s.figuresJson),
    inputsSha256: s.inputsSha256,
    engineVersion: s.engineVersion,
    preparedBy: s.preparedBy,
    preparedAt: iso(s.preparedAt),
    submittedBy: s.submittedBy,
    submittedAt: iso(s.submittedAt),
    approvedBy: s.approvedBy,
    approvedAt: iso(s.approvedAt),
    historySha256: sha256(s.historyJson),
    restatedAt: iso(s.restatedAt),
    restatementDetail: s.restatementDetail,
    // An amendment signs what it amends and its frozen before/after; an original's state is as it always was.
    ...(s.amendsId !== null && s.amendsId !== undefined
      ? { amendsId: s.amendsId, amendmentSha256: s.amendmentJson === null ? null : sha256(s.amendmentJson) }
      : {}),
  };
}
type SnapshotState = ReturnType<typeof snapshotState>;

/** What a link signs, besides its own signature. */
export interface LinkBody {
  v: 1;
  key: string;
  entityId: number;
  seq: number;
  kind: ChainLinkKind;
  snapshotId: number;
  at: string;
  prevMac: string | null;
  state: SnapshotState;
  /** The snapshot's seal (hash, prevHash) as its row keeps it; null on the link that makes the seal. */
  seal: { hash: string | null; prevHash: string | null } | null;
  /** What else the event fixed: the pack's sha256 and Message-ID when filed, who acknowledged it. */
  extra: Record<string, unknown> | null;
}

const headText = (entityId: number, seq: number, mac: string) => canonical({ key: KEY_ID, entityId, seq, mac });

/**
 * Appends a signed link for `snapshot` as it now stands, in the caller's transaction (the head row
 * is locked, so appends to one entity's chain take turns). Returns the link's signature and the
 * one before it: for a "sealed" link, they become the snapshot's hash and prevHash.
 */
export async function appendLink(
  snapshot: SnapshotFields,
  kind: ChainLinkKind,
  transaction: Transaction,
  extra: Record<string, unknown> | null = null,
): Promise<{ seq: number; mac: string; prevMac: string | null }> {
  const head = await ChainHeadModel.findByPk(snapshot.entityId, { transaction, lock: transaction.LOCK.UPDATE });
  const seq = (head?.seq ?? 0) + 1;
  const prevMac = head?.mac ?? null;
  const body: LinkBody = {
    v: 1,
    key: KEY_ID,
    entityId: snapshot.entityId,
    seq,
    kind,
    snapshotId: snapshot.id,
    at: new Date().toISOString(),
    prevMac,
    state: snapshotState(snapshot),
    seal: kind === "sealed" ? null : { hash: snapshot.hash, prevHash: snapshot.prevHash },
    extra,
  };
  const text = canonical(body);
  const mac = sign("snapshot-link", text);
  await ChainLinkModel.create(
    { entityId: snapshot.entityId, seq, snapshotId: snapshot.id, kind, body: text, mac },
    { transaction },
  );
  const headMac = sign("snapshot-head", headText(snapshot.entityId, seq, mac));
  if (head) await head.update({ seq, mac, headMac }, { transaction });
  else await ChainHeadModel.create({ entityId: snapshot.entityId, seq, mac, headMac }, { transaction });
  return { seq, mac, prevMac };
}

/** The signed record of one filing, as its "filed" and "acknowledged" links fixed it (null fields: no such link). */
export async function signedFilingRecord(
  entityId: number,
  filingId: number,
): Promise<{ filedSha256: string | null; acknowledgedSha256: string | null; problems: string[] }> {
  const result = await verifyChain(entityId);
  let filedSha256: string | null = null;
  let acknowledgedSha256: string | null = null;
  for (const link of result.bodies) {
    if (link.extra?.filingId !== filingId) continue;
    if (link.kind === "filed") filedSha256 = String(link.extra.packSha256);
    if (link.kind === "acknowledged") acknowledgedSha256 = String(link.extra.packSha256);
  }
  return { filedSha256, acknowledgedSha256, problems: result.problems.map((p) => p.detail) };
}

const FIELD_WORDS: Partial<Record<keyof SnapshotState, string>> = {
  status: "status",
  zone: "zone",
  counted: "counted exceptions",
  plusFactor: "plus factor",
  multiplier: "multiplier",
  capital: "capital requirement",
  addOn: "capital add-on",
  figuresSha256: "figures (sha256)",
  inputsSha256: "inputs hash",
  historySha256: "history events (sha256)",
  restatedAt: "restatement flag",
  restatementDetail: "restatement detail",
  amendsId: "amended snapshot",
  amendmentSha256: "before/after of the amendment (sha256)",
  approvedBy: "approver",
  approvedAt: "approval time",
  preparedBy: "preparer",
  submittedBy: "submitter",
};

function show(v: unknown): string {
  if (v === null || v === undefined) return "empty";
  const text = String(v);
  return /^[0-9a-f]{64}$/.test(text) ? `${text.slice(0, 12)}…` : text.length > 40 ? `${text.slice(0, 40)}…` : text;
}

/** In words, which fields of the stored snapshot differ from what the link signed. */
function stateDifferences(stored: SnapshotState, signed: SnapshotState): string[] {
  return (Object.keys(signed) as (keyof SnapshotState)[])
    .filter((k) => canonical(stored[k]) !== canonical(signed[k]))
    .map((k) => `${FIELD_WORDS[k] ?? k} is now ${show(stored[k])}, signed as ${show(signed[k])}`);
}

export interface ChainCheck {
  valid: boolean;
  links: number;
  problems: ChainProblem[];
  /** The bodies of the links whose signature holds, in order. */
  bodies: LinkBody[];
}

/**
 * Checks an entity's whole chain against the stored snapshots: every link's signature, the
 * numbering without gaps, each link's reference to the one before, the signed head, and that every
 * signed-off snapshot stands as its newest link says. Reads in one consistent view.
 */
export async function verifyChain(entityId: number, snapshots?: SnapshotFields[]): Promise<ChainCheck> {
  // The head, the links and the snapshots as of one moment: inside the caller's transaction (a
  // filing checks the seal under its own locks), else in a REPEATABLE READ one of their own.
  const read = async (transaction: Transaction) => {
    const head = await ChainHeadModel.findByPk(entityId, { transaction });
    return {
      head,
      links: await ChainLinkModel.findAll({ where: { entityId }, order: [["seq", "ASC"]], transaction }),
      rows: snapshots ?? (await SnapshotModel.findAll({ where: { entityId }, transaction })),
    };
  };
  const outer = currentTransaction();
  const { links, head, rows } = outer
    ? await read(outer)
    : await sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, read);
  const problems: ChainProblem[] = [];
  const bodies: LinkBody[] = [];
  const latest = new Map<number, { body: LinkBody; mac: string }>();
  const label = (state: { quarterEnd: string; snapshotId: number }) =>
    `${quarterLabel(state.quarterEnd)} (snapshot #${state.snapshotId})`;

  let prevMac: string | null = null;
  let expectedSeq = 1;
  for (const link of links) {
    let body: LinkBody | null;
    try {
      body = JSON.parse(link.body) as LinkBody;
    } catch {
      body = null;
    }
    const where = { seq: link.seq, snapshotId: link.snapshotId };
    if (!body || !signatureMatches("snapshot-link", link.body, link.mac)) {
      const other = body && body.key !== KEY_ID ? ` (it names key ${body.key}; this server's key is ${KEY_ID})` : "";
      problems.push({
        ...where,
        detail: `Link ${link.seq}${body ? ` (${body.kind} ${label(body.state)})` : ""} does not carry a valid signature${other}: it was altered or written without the key.`,
      });
      prevMac = link.mac;
      expectedSeq = link.seq + 1;
      continue;
    }
    if (
      link.seq !== body.seq ||
      link.snapshotId !== body.snapshotId ||
      link.kind !== body.kind ||
      body.entityId !== entityId
    )
      problems.push({ ...where, detail: `Link ${link.seq}'s columns differ from what it signed: it was moved.` });
    if (body.seq > expectedSeq)
      problems.push({
        ...where,
        detail: `Link${body.seq - expectedSeq > 1 ? `s ${expectedSeq}–${body.seq - 1} are` : ` ${expectedSeq} is`} missing before link ${body.seq}: deleted.`,
      });
    else if (body.seq < expectedSeq)
      problems.push({ ...where, detail: `Link ${body.seq} appears twice or out of order.` });
    if (body.prevMac !== prevMac)
      problems.push({
        ...where,
        detail: `Link ${body.seq} does not follow the link before it (it names ${show(body.prevMac)}): a link was removed or replaced.`,
      });
    bodies.push(body);
    latest.set(body.snapshotId, { body, mac: link.mac });
    prevMac = link.mac;
    expectedSeq = body.seq + 1;
  }

  const last = links.at(-1);
  if (!head) {
    if (links.length)
      problems.push({
        seq: null,
        snapshotId: null,
        detail: "The chain has links but no signed head: the head was deleted.",
      });
  } else if (!signatureMatches("snapshot-head", headText(entityId, head.seq, head.mac), head.headMac)) {
    problems.push({
      seq: null,
      snapshotId: null,
      detail: "The chain head's signature does not hold: the head was altered.",
    });
  } else if (!last || head.seq > last.seq) {
    problems.push({
      seq: head.seq,
      snapshotId: null,
      detail: `The signed head counts ${head.seq} link${head.seq === 1 ? "" : "s"} but ${last ? `the newest is link ${last.seq}` : "none remain"}: the newest link${head.seq - (last?.seq ?? 0) > 1 ? "s were" : " was"} deleted.`,
    });
  } else if (head.seq !== last.seq || head.mac !== last.mac) {
    problems.push({
      seq: last.seq,
      snapshotId: last.snapshotId,
      detail: `The signed head names link ${head.seq}, not the newest link ${last.seq}: links were added without the key.`,
    });
  }

  const present = new Map(rows.map((r) => [r.id, r]));
  for (const [snapshotId, { body, mac }] of latest) {
    const row = present.get(snapshotId);
    if (!row) {
      problems.push({
        seq: body.seq,
        snapshotId,
        detail: `${label(body.state)} was signed off in link ${body.seq} but is missing from the database: deleted.`,
      });
      continue;
    }
    const differences = stateDifferences(snapshotState(row), body.state);
    const seal = body.seal ?? (body.kind === "sealed" ? { hash: mac, prevHash: body.prevMac } : null);
    if (seal && (row.hash !== seal.hash || row.prevHash !== seal.prevHash))
      differences.push(`its seal is now ${show(row.hash)}, signed as ${show(seal.hash)}`);
    if (differences.length)
      problems.push({
        seq: body.seq,
        snapshotId,
        detail: `${label(body.state)}: ${differences.join("; ")} (link ${body.seq}): changed behind the application's back.`,
      });
  }
  for (const row of rows) {
    if (latest.has(row.id) || (row.hash === null && row.status !== "approved" && row.status !== "filed")) continue;
    problems.push({
      seq: null,
      snapshotId: row.id,
      detail: `${quarterLabel(row.quarterEnd)} (snapshot #${row.id}) is ${row.status}${row.hash ? " with a seal" : ""} but no signed link covers it: it was not signed off through Quartermark.`,
    });
  }
  return { valid: problems.length === 0, links: links.length, problems, bodies };
}
