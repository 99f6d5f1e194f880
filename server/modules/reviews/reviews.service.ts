import { findLocked, lockedRow } from "../../kit/lookups";
import { createHash } from "node:crypto";
import { sequelize } from "../../db/sequelize";
import { lockEntityPortfolios } from "../../db/portfolio-locks";
import { refreshEntityFigures } from "../figures/stored-figures";
import { ExceptionReviewModel } from "../../models/exception-review";
import { EvidenceFileModel } from "../../models/evidence-file";
import { ExclusionDecisionModel } from "../../models/exclusion-decision";
import { ObservationModel } from "../../models/observation";
import { ZodError } from "zod";
import { AppError, BadRequestError, ConflictError, NotFoundError, ValidationError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { findPortfolio } from "../figures/engine-inputs";
import { plainFileName } from "../../kit/file-name";
import type { Transaction } from "sequelize";
import type { PortfolioModel } from "../../models/portfolio";
import type { EntityModel } from "../../models/entity";
import { reviewsByDate } from "./reviews.read";
import { flagExclusionDecision } from "../snapshots/snapshots.restatements";
import { classifyDay } from "../../../shared/backtest/exceptions";
import { getRegime } from "../../../shared/backtest/regimes";
import type { SignedIn } from "../../kit/actor";
import type { DecisionBody, ExclusionStatus, Review, ReviewBody } from "../../../shared/schemas/review";
import { checkVersion } from "../../kit/stale";

export const EVIDENCE_MAX_BYTES = 10 * 1024 * 1024;

/** Evidence types we keep, recognised by their first bytes (not by the name the browser sent). */
function sniffEvidenceType(bytes: Buffer, fileName: string): string | null {
  if (bytes.subarray(0, 5).toString("latin1") === "%PDF-") return "application/pdf";
  if (bytes.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return "image/png";
  if (bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg";
  if (/\.(txt|csv|eml|msg)$/i.test(fileName) && !bytes.includes(0)) {
    try {
      new TextDecoder("utf-8", { fatal: true }).decode(bytes);
      return /\.csv$/i.test(fileName) ? "text/csv" : "text/plain";
    } catch {
      return null;
    }
  }
  return null;
}

async function currentReview(portfolioId: number, date: string): Promise<Review | null> {
  return (await reviewsByDate(portfolioId, [date])).get(date) ?? null;
}

/** Only a day that is an exception on the current data can be reviewed (read under the portfolio lock). */
async function assertExceptionDay(
  code: string,
  date: string,
  portfolio: PortfolioModel,
  entity: EntityModel,
  transaction: Transaction,
) {
  const day = await ObservationModel.findOne({
    where: { portfolioId: portfolio.id, businessDate: date, isCurrent: true },
    transaction,
  });
  if (!day) throw new NotFoundError(`${code} has no data for ${date}.`);
  const c = classifyDay(
    day.actualPnl,
    day.hypotheticalPnl,
    day.var99,
    getRegime(entity.regime).missingCountsAsException,
  );
  if (!c.actual && !c.hypothetical)
    throw new AppError(
      422,
      "not_an_exception",
      `${date} is not an exception day for ${code}: the loss did not exceed VaR.`,
    );
}

/**
 * An analyst explains an exception and may ask for it to be disregarded. The row version makes
 * a second writer who saw an older review get 409 with the current one.
 */
export async function saveReview(code: string, date: string, body: ReviewBody, actor: SignedIn): Promise<Review> {
  const { portfolio, entity } = await findPortfolio(code);
  await sequelize.transaction(async (transaction) => {
    // Lock the portfolio row first: two first reviews of one day queue instead of deadlocking, and
    // an upload restating the day waits (or is waited for) before the day is judged an exception.
    await lockEntityPortfolios(entity.id, transaction);
    await assertExceptionDay(code, date, portfolio, entity, transaction);
    const row = await findLocked(ExceptionReviewModel, { portfolioId: portfolio.id, businessDate: date }, transaction);
    await checkVersion(row?.version ?? 0, body.version ?? 0, async () => ({
      message: row
        ? `Someone else changed this review (now version ${row.version}). Here is the current one; apply your change to it.`
        : "This review no longer exists.",
      current: await currentReview(portfolio.id, date),
    }));
    const before = row ? { cause: row.cause, narrative: row.narrative, exclusionStatus: row.exclusionStatus } : null;
    let exclusionStatus: ExclusionStatus = row?.exclusionStatus ?? "none";
    if (body.exclusion && (exclusionStatus === "none" || exclusionStatus === "rejected")) exclusionStatus = "requested";
    if (!body.exclusion && exclusionStatus === "requested") exclusionStatus = "none";
    if (exclusionStatus === "approved") {
      // The supervisor approved this explanation: neither the request nor its grounds change quietly.
      throw new ConflictError(
        "The supervisor approved disregarding this exception on the recorded explanation; it can no longer be changed here.",
      );
    }
    if (row) {
      await row.update(
        {
          cause: body.cause,
          narrative: body.narrative,
          exclusionStatus,
          reviewedBy: actor.user.id,
          version: row.version + 1,
        },
        { transaction },
      );
    } else {
      await ExceptionReviewModel.create(
        {
          portfolioId: portfolio.id,
          businessDate: date,
          cause: body.cause,
          narrative: body.narrative,
          exclusionStatus,
          decisionReference: null,
          decisionDate: null,
          decidedBy: null,
          reviewedBy: actor.user.id,
        },
        { transaction },
      );
    }
    await recordAudit(
      actor,
      "exception.review",
      `${code}/${date}`,
      { before, after: { cause: body.cause, narrative: body.narrative, exclusionStatus } },
      transaction,
    );
    await refreshEntityFigures([entity.id], transaction); // the Overview counts exceptions nobody reviewed yet
  });
  return (await currentReview(portfolio.id, date))!;
}

/** The CRO records the supervisor's decision on an exclusion request. */
export async function recordDecision(code: string, date: string, body: DecisionBody, actor: SignedIn): Promise<Review> {
  const { portfolio, entity } = await findPortfolio(code);
  await sequelize.transaction(async (transaction) => {
    // The entity's books first (the order of every writer), then the review.
    await lockEntityPortfolios(entity.id, transaction);
    const row = await lockedRow(
      ExceptionReviewModel,
      { portfolioId: portfolio.id, businessDate: date },
      transaction,
      `No review of ${code} on ${date}; an analyst explains the exception first.`,
    );
    await checkVersion(row.version, body.version, async () => ({
      message: `The review changed since you opened it (now version ${row.version}).`,
      current: await currentReview(portfolio.id, date),
    }));
    if (row.exclusionStatus === "none") throw new ConflictError("No exclusion was requested for this exception.");
    // A recorded decision is never edited: a correction supersedes it with a new record and its reason.
    const previous = await ExclusionDecisionModel.findOne({
      where: { reviewId: row.id },
      order: [["id", "DESC"]],
      transaction,
    });
    const correcting = row.exclusionStatus !== "requested" && previous !== null;
    if (correcting && !body.correctionReason)
      throw new ValidationError(
        new ZodError([
          {
            code: "custom",
            path: ["correctionReason"],
            message: "A decision is already recorded: say why this one supersedes it",
            input: undefined,
          },
        ]),
      );
    const before = { exclusionStatus: row.exclusionStatus, decisionReference: row.decisionReference };
    const record = await ExclusionDecisionModel.create(
      {
        reviewId: row.id,
        decision: body.decision,
        reference: body.reference,
        decidedOn: body.decidedOn,
        decidedBy: actor.user.id,
        recordedAt: new Date(),
        supersedesId: correcting ? previous.id : null,
        correctionReason: correcting ? body.correctionReason! : null,
      },
      { transaction },
    );
    await row.update(
      {
        exclusionStatus: body.decision,
        decisionReference: body.reference,
        decisionDate: body.decidedOn,
        decidedBy: actor.user.id,
        version: row.version + 1,
      },
      { transaction },
    );
    await recordAudit(
      actor,
      `exception.exclusion_${body.decision}`,
      `${code}/${date}`,
      {
        before,
        after: {
          exclusionStatus: body.decision,
          decisionReference: body.reference,
          decisionDate: body.decidedOn,
          decisionRecord: record.id,
          ...(correcting ? { supersedes: previous.id, correctionReason: body.correctionReason } : {}),
        },
      },
      transaction,
    );
    // An approved exclusion changes what the figures would be; a signed-off quarter keeps its own and is flagged.
    if (before.exclusionStatus === "approved" || body.decision === "approved") {
      await flagExclusionDecision(portfolio.id, date, actor, transaction);
    }
    // An exclusion approved or withdrawn changes the count; a decision also settles an open request.
    await refreshEntityFigures([entity.id], transaction);
  });
  return (await currentReview(portfolio.id, date))!;
}

export async function addEvidence(
  code: string,
  date: string,
  file: { originalName: string; bytes: Buffer },
  actor: SignedIn,
): Promise<Review> {
  const { portfolio } = await findPortfolio(code);
  const name = plainFileName(file.originalName);
  if (file.bytes.length === 0) throw new BadRequestError("The file is empty.");
  const contentType = sniffEvidenceType(file.bytes, name);
  if (!contentType)
    throw new AppError(
      415,
      "unsupported_media_type",
      "Evidence must be a PDF, PNG, JPEG, or a plain-text / CSV / e-mail text file.",
    );
  const review = await ExceptionReviewModel.findOne({ where: { portfolioId: portfolio.id, businessDate: date } });
  if (!review) throw new ConflictError("Write the review first; evidence is attached to a review.");
  await sequelize.transaction(async (transaction) => {
    const sha256 = createHash("sha256").update(file.bytes).digest("hex");
    const row = await EvidenceFileModel.create(
      {
        reviewId: review.id,
        fileName: name,
        contentType,
        sizeBytes: file.bytes.length,
        sha256,
        content: file.bytes,
        uploadedBy: actor.user.id,
      },
      { transaction },
    );
    await recordAudit(
      actor,
      "exception.evidence",
      `${code}/${date}`,
      { after: { id: row.id, fileName: name, contentType, sha256 } },
      transaction,
    );
  });
  return (await currentReview(portfolio.id, date))!;
}

export async function getEvidence(id: number): Promise<{ fileName: string; content: Buffer; sha256: string }> {
  const row = await EvidenceFileModel.scope("withContent").findByPk(id);
  if (!row) throw new NotFoundError(`No evidence file #${id}.`);
  return { fileName: row.fileName, content: row.content, sha256: row.sha256 };
}
