import type { Transaction } from "sequelize";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { recordAudit } from "../audit/audit.service";
import { appendLink } from "../snapshot-chain/snapshot-chain";
import { SIGNED_OFF, type SnapshotFigures } from "../../../shared/schemas/snapshot";
import { snapshotEvent, withEvent } from "./snapshot-events";
import type { SignedIn } from "../../kit/actor";

// A day restated after sign-off flags the snapshots whose window holds it; their figures stay as approved.

/** A day an upload writes: version 1 is a day stored for the first time, a higher one restates a stored day. */
export interface WrittenDay {
  portfolioId: number;
  version: number;
  row: { date: string };
}

type Change = { portfolioId: number; date: string; kind: "restated" | "added" | "exclusion decided" };

const CHANGE_WORDS: Record<Change["kind"], string> = {
  restated: "restated",
  added: "added where there was no data",
  "exclusion decided": "with an exclusion decided",
};

/** The signed-off snapshots of the entities these portfolios belong to, locked, with each portfolio's entity and code. */
async function signedOffOf(portfolioIds: number[], transaction: Transaction) {
  const portfolios = await PortfolioModel.findAll({
    where: { id: portfolioIds },
    attributes: ["id", "entityId", "code"],
    transaction,
  });
  const entityIds = [...new Set(portfolios.map((p) => p.entityId))];
  const signedOff = entityIds.length
    ? await SnapshotModel.findAll({
        where: { entityId: entityIds, status: [...SIGNED_OFF] },
        transaction,
        lock: transaction.LOCK.UPDATE,
      })
    : [];
  // A snapshot that has an amendment is never touched again: the change flags the amendment once
  // it is signed off, and a draft amendment is recomputed when prepared again (docs/api.md#amendments).
  const amended = new Set(
    signedOff.length
      ? (
          await SnapshotModel.findAll({
            where: { amendsId: signedOff.map((s) => s.id) },
            attributes: ["amendsId"],
            transaction,
          })
        ).map((s) => s.amendsId)
      : [],
  );
  return {
    snapshots: signedOff.filter((s) => !amended.has(s.id)),
    entityOf: new Map(portfolios.map((p) => [p.id, p.entityId])),
    codeOf: new Map(portfolios.map((p) => [p.id, p.code])),
  };
}

/**
 * Flags every signed-off snapshot whose window holds one of the changed days (in the caller's
 * transaction). Its figures stay as approved; the flag says which days changed, how and by what.
 */
async function flagSignedOff(
  found: Awaited<ReturnType<typeof signedOffOf>>,
  changes: readonly Change[],
  source: string,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  let flagged = 0;
  for (const snapshot of found.snapshots) {
    // A short window reaches back to the first day there is: a day added before it would join it.
    const complete = (JSON.parse(snapshot.figuresJson) as SnapshotFigures).window.complete;
    const from = complete ? (snapshot.windowStart ?? snapshot.asOf) : "0000-01-01";
    const days = changes.filter(
      (k) => k.date >= from && k.date <= snapshot.quarterEnd && found.entityOf.get(k.portfolioId) === snapshot.entityId,
    );
    if (days.length === 0) continue;
    const counts = (Object.keys(CHANGE_WORDS) as Change["kind"][])
      .map((kind) => [kind, days.filter((d) => d.kind === kind).length] as const)
      .filter(([, n]) => n > 0);
    const what = counts.map(([kind, n]) => `${n} ${CHANGE_WORDS[kind]}`).join(", ");
    const listed = days
      .slice(0, 5)
      .map((k) => `${found.codeOf.get(k.portfolioId)} ${k.date}`)
      .join(", ");
    const line = `${days.length} day${days.length === 1 ? "" : "s"} inside this snapshot's window changed by ${source}: ${what} (${listed}${days.length > 5 ? ", …" : ""}).`;
    await snapshot.update(
      {
        restatedAt: new Date(),
        restatementDetail: snapshot.restatementDetail ? `${snapshot.restatementDetail}\n${line}` : line,
        historyJson: withEvent(snapshot, { ...snapshotEvent(actor, "restated"), comment: line }),
        version: snapshot.version + 1,
      },
      { transaction },
    );
    // The flag is signed into the entity's chain: it cannot be cleared behind the application's back.
    await appendLink(snapshot, "restated", transaction);
    await recordAudit(
      actor,
      "snapshot.restated",
      `snapshot #${snapshot.id}`,
      { after: { source, ...Object.fromEntries(counts) } },
      transaction,
    );
    flagged++;
  }
  return flagged;
}

/** An upload wrote days — restated them, or filled days that had no data: flags the signed-off snapshots whose window holds them. */
export async function flagChangedSnapshots(
  written: readonly WrittenDay[],
  uploadId: number,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  if (written.length === 0) return 0;
  const found = await signedOffOf([...new Set(written.map((k) => k.portfolioId))], transaction);
  if (found.snapshots.length === 0) return 0;
  const changes = written.map((k): Change => ({
    portfolioId: k.portfolioId,
    date: k.row.date,
    kind: k.version > 1 ? "restated" : "added",
  }));
  return flagSignedOff(found, changes, `upload #${uploadId}`, actor, transaction);
}

/** The CRO recorded the supervisor's decision on an exclusion: the signed-off snapshots whose window holds that day are flagged. */
export async function flagExclusionDecision(
  portfolioId: number,
  date: string,
  actor: SignedIn,
  transaction: Transaction,
): Promise<number> {
  const found = await signedOffOf([portfolioId], transaction);
  return flagSignedOff(
    found,
    [{ portfolioId, date, kind: "exclusion decided" }],
    `the exclusion decision recorded for ${date}`,
    actor,
    transaction,
  );
}
