import { Op } from "sequelize";
import { ExceptionReviewModel } from "../../models/exception-review";
import { EvidenceFileModel } from "../../models/evidence-file";
import { ExclusionDecisionModel } from "../../models/exclusion-decision";
import type { Evidence, ExclusionDecision, Review } from "../../../shared/schemas/review";
import { emailsById } from "../../kit/lookups";

/** Reviews of a portfolio's exception days (with their evidence), keyed by date. */
export async function reviewsByDate(portfolioId: number, dates?: string[]): Promise<Map<string, Review>> {
  const where = dates ? { portfolioId, businessDate: { [Op.in]: dates } } : { portfolioId };
  const rows = await ExceptionReviewModel.findAll({ where });
  if (rows.length === 0) return new Map();
  const evidence = await EvidenceFileModel.findAll({
    where: { reviewId: rows.map((r) => r.id) },
    order: [["id", "ASC"]],
  });
  const decisions = await ExclusionDecisionModel.findAll({
    where: { reviewId: rows.map((r) => r.id) },
    order: [["id", "ASC"]],
  });
  const supersededIds = new Set(decisions.map((d) => d.supersedesId).filter((id): id is number => id !== null));
  const userIds = new Set<number>();
  for (const d of decisions) if (d.decidedBy) userIds.add(d.decidedBy);
  for (const r of rows) {
    userIds.add(r.reviewedBy);
    if (r.decidedBy) userIds.add(r.decidedBy);
  }
  for (const e of evidence) userIds.add(e.uploadedBy);
  const emails = await emailsById(userIds);
  const emailOf = (id: number | null) => (id ? (emails.get(id) ?? null) : null);
  const toEvidence = (e: EvidenceFileModel): Evidence => ({
    id: e.id,
    fileName: e.fileName,
    contentType: e.contentType,
    sizeBytes: e.sizeBytes,
    sha256: e.sha256,
    uploadedBy: emails.get(e.uploadedBy) ?? "unknown",
    uploadedAt: e.createdAt.toISOString(),
  });
  const toDecision = (d: ExclusionDecisionModel): ExclusionDecision => ({
    id: d.id,
    decision: d.decision,
    reference: d.reference,
    decidedOn: d.decidedOn,
    recordedBy: emailOf(d.decidedBy),
    recordedAt: d.recordedAt.toISOString(),
    supersedes: d.supersedesId,
    correctionReason: d.correctionReason,
    superseded: supersededIds.has(d.id),
  });
  const out = new Map<string, Review>();
  for (const r of rows) {
    out.set(r.businessDate, {
      date: r.businessDate,
      cause: r.cause,
      narrative: r.narrative,
      exclusionStatus: r.exclusionStatus,
      decisionReference: r.decisionReference,
      decisionDate: r.decisionDate,
      decidedBy: emailOf(r.decidedBy),
      reviewedBy: emails.get(r.reviewedBy) ?? "unknown",
      reviewedAt: r.updatedAt.toISOString(),
      version: r.version,
      evidence: evidence.filter((e) => e.reviewId === r.id).map(toEvidence),
      decisions: decisions.filter((d) => d.reviewId === r.id).map(toDecision),
    });
  }
  return out;
}
