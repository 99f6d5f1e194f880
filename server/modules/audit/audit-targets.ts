import { Op } from "sequelize";
import { ApiTokenModel } from "../../models/api-token";
import { DataFindingModel } from "../../models/data-finding";
import { EntityModel } from "../../models/entity";
import { FilingModel } from "../../models/filing";
import { PortfolioModel } from "../../models/portfolio";
import { SnapshotModel } from "../../models/snapshot";
import { UploadModel } from "../../models/upload";
import { UserModel } from "../../models/user";
import { quarterLabel } from "../../../shared/backtest/quarters";

// The audit log keeps each target as it was signed ("snapshot #17", "upload #5", an e-mail); a reader needs it in
// words. These are read for one page of events at once, never written back (the signed record stays as it is).

const NUMBERED = /^(snapshot|filing|upload|finding|user|api token) #(\d+)$/;

type Kind = "snapshot" | "filing" | "upload" | "finding" | "user" | "api token";

/** Each target of these events in words ("LKS-EU Q3 2026 snapshot"), and each actor's name, by the stored text. */
export async function auditWords(
  events: readonly { target: string | null; actorEmail: string | null }[],
): Promise<{ targets: Map<string, string>; names: Map<string, string> }> {
  const ids: Record<Kind, Set<number>> = {
    snapshot: new Set(),
    filing: new Set(),
    upload: new Set(),
    finding: new Set(),
    user: new Set(),
    "api token": new Set(),
  };
  const emails = new Set<string>();
  for (const e of events) {
    if (e.actorEmail) emails.add(e.actorEmail);
    if (!e.target) continue;
    const m = NUMBERED.exec(e.target);
    if (m) ids[m[1] as Kind].add(Number(m[2]));
    else if (e.target.includes("@")) emails.add(e.target);
  }
  const [filings, uploads, findings, tokens] = await Promise.all([
    ids.filing.size ? FilingModel.findAll({ where: { id: [...ids.filing] }, attributes: ["id", "snapshotId"] }) : [],
    ids.upload.size ? UploadModel.findAll({ where: { id: [...ids.upload] }, attributes: ["id", "fileName"] }) : [],
    ids.finding.size
      ? DataFindingModel.findAll({ where: { id: [...ids.finding] }, attributes: ["id", "portfolioId", "kind"] })
      : [],
    ids["api token"].size
      ? ApiTokenModel.findAll({ where: { id: [...ids["api token"]] }, attributes: ["id", "name", "userId"] })
      : [],
  ]);
  for (const f of filings) ids.snapshot.add(f.snapshotId);
  for (const t of tokens) ids.user.add(t.userId);
  const [snapshots, portfolios, users] = await Promise.all([
    ids.snapshot.size
      ? SnapshotModel.findAll({
          where: { id: [...ids.snapshot] },
          attributes: ["id", "entityId", "quarterEnd", "amendsId"],
        })
      : [],
    findings.length
      ? PortfolioModel.findAll({ where: { id: findings.map((f) => f.portfolioId) }, attributes: ["id", "code"] })
      : [],
    ids.user.size || emails.size
      ? UserModel.findAll({
          attributes: ["id", "email", "name"],
          where: { [Op.or]: [{ id: [...ids.user] }, { email: [...emails] }] },
        })
      : [],
  ]);
  const entities = snapshots.length
    ? await EntityModel.findAll({
        where: { id: [...new Set(snapshots.map((s) => s.entityId))] },
        attributes: ["id", "code"],
      })
    : [];
  const codeOf = new Map(entities.map((e) => [e.id, e.code]));
  const snapshotWords = new Map(
    snapshots.map((s) => [
      s.id,
      `${codeOf.get(s.entityId) ?? "?"} ${quarterLabel(s.quarterEnd)} ${s.amendsId ? "amendment" : "snapshot"}`,
    ]),
  );
  const userById = new Map(users.map((u) => [u.id, u]));
  const names = new Map(users.map((u) => [u.email, u.name]));
  const portfolioCode = new Map(portfolios.map((p) => [p.id, p.code]));

  const targets = new Map<string, string>();
  for (const s of snapshots) if (snapshotWords.has(s.id)) targets.set(`snapshot #${s.id}`, snapshotWords.get(s.id)!);
  for (const f of filings) {
    const words = snapshotWords.get(f.snapshotId);
    if (words) targets.set(`filing #${f.id}`, `filing of the ${words}`);
  }
  for (const u of uploads) targets.set(`upload #${u.id}`, `upload #${u.id} (${u.fileName})`);
  for (const f of findings) {
    const kind = String(f.kind).replace(/_/g, " ");
    targets.set(`finding #${f.id}`, `${kind} finding on ${portfolioCode.get(f.portfolioId) ?? "?"}`);
  }
  for (const id of ids.user) {
    const u = userById.get(id);
    if (u) targets.set(`user #${id}`, u.name);
  }
  for (const t of tokens) {
    const owner = userById.get(t.userId);
    targets.set(`api token #${t.id}`, `API token “${t.name}”${owner ? ` of ${owner.name}` : ""}`);
  }
  for (const email of emails) {
    const name = names.get(email);
    if (name) targets.set(email, name);
  }
  return { targets, names };
}
