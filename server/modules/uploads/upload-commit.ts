import { UniqueConstraintError, type Transaction } from "sequelize";
import { notifyNewExceptions } from "../notifications/notices";
import { openNoticesForCommit } from "../notices/notices.open";
import { sequelize } from "../../db/sequelize";
import { lockPortfolios } from "../../db/portfolio-locks";
import { entitiesOfPortfolios, refreshEntityFigures } from "../figures/stored-figures";
import { UploadModel } from "../../models/upload";
import { PortfolioModel } from "../../models/portfolio";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import {
  PipelinedWrites,
  loadCurrentDays,
  queueInsertVersions,
  INSERT_BATCH_ROWS,
  queueRetireVersions,
} from "../observations/observations.repository";
import { applyFindings, checkFindings, loadFindingInputs } from "../findings/findings.service";
import { flagChangedSnapshots } from "../snapshots/snapshots.restatements";
import { unpackBytes } from "./stored-bytes";
import { checkedRowsOf, forgetCheckedRows } from "./preview-cache";
import { duplicateError, findCommittedTwin, loadReferenceData, parseFile } from "./upload-files";
import { recheckReferenceData, type CsvReferenceData, type ParsedRow } from "../../../shared/ingest/parse-csv";
import {
  classify,
  currentDaysInSpan,
  restatedDays,
  spanOf,
  type NewVersion,
  type StoredDay,
} from "../../../shared/ingest/row-plan";
import { quarterLabel } from "../../../shared/backtest/quarters";
import type { CommitResult, CommitUploadBody } from "../../../shared/schemas/upload";
import { signedOffDays } from "./signed-off-days";
import { previewExpiry } from "./uploads.service";
import { config } from "../../config";
import type { SignedIn } from "../../kit/actor";

/** Portfolio ids the preview named (from its summary), sorted. */
async function previewPortfolioIds(upload: UploadModel, transaction: Transaction): Promise<number[]> {
  const codes: string[] = upload.summaryJson ? JSON.parse(upload.summaryJson).portfolios : [];
  if (codes.length === 0) return [];
  // Every book of the entities named: the figures refresh reads them all (server/modules/figures).
  const found = await PortfolioModel.findAll({ where: { code: codes }, attributes: ["entityId"], transaction });
  if (found.length === 0) return [];
  const books = await PortfolioModel.findAll({
    where: { entityId: [...new Set(found.map((p) => p.entityId))] },
    attributes: ["id"],
    transaction,
  });
  return books.map((p) => p.id).sort((a, b) => a - b);
}

/**
 * Writes a clean preview's rows in one transaction: restated days get a new version and keep
 * the old one; the same file can be committed only once (unique committed_sha256). The rows are
 * sent as pipelined multi-row INSERTs, and the data-quality checks run while MariaDB writes them.
 */
export async function commitUpload(id: number, actor: SignedIn, body: CommitUploadBody = {}): Promise<CommitResult> {
  let written: { portfolioId: number; date: string }[] = [];
  const result = await sequelize.transaction(async (transaction) => {
    const upload = await UploadModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!upload) throw new NotFoundError(`No upload #${id}.`);
    if (upload.status === "committed") throw new ConflictError(`Upload #${id} is already committed.`);
    if (upload.status === "discarded") throw new ConflictError(`Upload #${id} was discarded; upload the file again.`);
    const expiry = previewExpiry(upload.createdAt);
    if (expiry.getTime() <= Date.now()) {
      throw new AppError(
        409,
        "preview_expired",
        `The preview of upload #${id} expired at ${expiry.toISOString().slice(0, 16).replace("T", " ")} UTC (previews wait ${config.uploads.previewTtlHours} hours). Upload the file again: it is checked against the data as it now stands. Nothing was written.`,
      );
    }
    // Commits touching the same portfolios take turns (locks in id order, so no deadlock).
    const lockedIds = await previewPortfolioIds(upload, transaction);
    // The portfolio rows this commit holds: the only parents its rows may name (queueInsertVersions checks).
    const held = await lockPortfolios(lockedIds, "update", transaction);
    if (upload.invalidCount > 0) {
      throw new AppError(
        422,
        "preview_has_errors",
        `Upload #${id} has ${upload.invalidCount} invalid row(s). Fix the file and upload it again; nothing was written.`,
      );
    }
    const twin = await findCommittedTwin(upload.sha256, id);
    if (twin) throw duplicateError(twin);

    // Re-check against today's reference data, read after the locks (holiday changes take the same locks).
    const ref = await loadReferenceData(transaction);
    const rows = checkedRowsOf(id, upload.sha256) ?? (await parseStoredFile(id, ref, transaction));
    if (recheckReferenceData(rows, ref).length) {
      throw new ConflictError(
        "The reference data changed since the preview and some rows are no longer valid. Upload the file again to see why.",
      );
    }
    const { range, portfolioIds } = spanOf(rows, ref.ids);
    const stored = range
      ? await loadCurrentDays(portfolioIds, range.from, range.to, transaction, true)
      : new Map<string, StoredDay>();
    // A day restated in an approved or filed quarter is committed only when the person said so, knowing it.
    const signedOff = await signedOffDays(restatedDays(rows, ref.ids, stored).keys, transaction);
    if (signedOff.count > 0 && body.confirmSignedOff !== true) {
      const quarters = signedOff.quarters
        .map(
          (q) => `${q.entity} ${quarterLabel(q.quarterEnd)} (${q.status}, ${q.days} ${q.days === 1 ? "day" : "days"})`,
        )
        .join(", ");
      throw new AppError(
        409,
        "signed_off_restatement",
        `This file restates ${signedOff.count} ${signedOff.count === 1 ? "day" : "days"} in signed-off quarters: ${quarters}. Their snapshots keep the figures as signed off and are marked restated. Confirm that you mean to restate them and commit again; nothing was written.`,
        { quarters: signedOff.quarters },
      );
    }
    // What the checks need from the database is read before the writes are queued behind it.
    const findingInputs = range ? await loadFindingInputs(portfolioIds, { transaction, outside: range }) : [];

    // Sorted and sent a batch at a time, so that MariaDB starts writing while the rest is sorted.
    const writes = new PipelinedWrites(transaction);
    const inserts: NewVersion[] = [];
    let restated = 0;
    let unchanged = 0;
    for (let start = 0; start < rows.length; start += INSERT_BATCH_ROWS) {
      const part = classify(rows.slice(start, start + INSERT_BATCH_ROWS), ref.ids, stored);
      queueRetireVersions(writes, part.retire);
      await queueInsertVersions(writes, part.inserts, upload.id, held);
      for (const written of part.inserts) inserts.push(written);
      restated += part.restated;
      unchanged += part.unchanged;
    }
    // The checks run here while MariaDB writes; the findings change with the data, in this transaction.
    const inside = range ? currentDaysInSpan(rows, ref.ids, stored) : undefined;
    const found = [];
    for (const input of findingInputs) {
      found.push(checkFindings(input, inside));
      await writes.flush();
    }
    await writes.done();
    await applyFindings(found, transaction);
    // Signed-off figures never change; a day written inside a signed-off window flags that snapshot.
    await flagChangedSnapshots(inserts, upload.id, actor, transaction);
    // The stored figures follow the data in the same transaction: no reader sees one without the other.
    await refreshEntityFigures(await entitiesOfPortfolios(portfolioIds, transaction), transaction);
    // EU entities: each new overshooting of the top-of-house book opens its notice with the data (CRR Art. 366(5)).
    await openNoticesForCommit(
      inserts.map((v) => ({ portfolioId: v.portfolioId, date: v.row.date })),
      upload.id,
      actor,
      transaction,
    );

    upload.status = "committed";
    upload.committedSha256 = upload.sha256;
    upload.committedAt = new Date();
    upload.committedBy = actor.user.id;
    upload.insertedCount = inserts.length;
    upload.restatedCount = restated;
    upload.unchangedCount = unchanged;
    upload.newCount = inserts.length - restated;
    try {
      await upload.save({ transaction });
    } catch (err) {
      if (err instanceof UniqueConstraintError) {
        const other = await findCommittedTwin(upload.sha256, id);
        throw other
          ? duplicateError(other)
          : new ConflictError("This exact file was committed by someone else a moment ago.");
      }
      throw err;
    }
    written = inserts.map((v) => ({ portfolioId: v.portfolioId, date: v.row.date }));
    await recordAudit(
      actor,
      "upload.commit",
      `upload #${id}`,
      {
        after: {
          inserted: inserts.length,
          restated,
          unchanged,
          sha256: upload.sha256,
          ...(signedOff.count > 0 ? { signedOffRestated: signedOff.count, signedOffQuarters: signedOff.quarters } : {}),
        },
      },
      transaction,
    );
    return { id, status: "committed" as const, inserted: inserts.length, restated, unchanged };
  });
  forgetCheckedRows(id);
  // Told once the days are committed, from the figures now stored; a mail failure changes nothing here.
  void notifyNewExceptions(written);
  return result;
}

/** The preview's rows when this process no longer holds them: the stored file, parsed again. */
async function parseStoredFile(
  id: number,
  ref: CsvReferenceData,
  transaction: Transaction,
): Promise<readonly ParsedRow[]> {
  const withContent = await UploadModel.scope("withContent").findByPk(id, {
    attributes: ["id", "content"],
    transaction,
  });
  if (!withContent?.content) throw new ConflictError(`Upload #${id} no longer holds its file; upload it again.`);
  const parsed = parseFile(unpackBytes(withContent.content), ref);
  if (parsed.errorCount) {
    throw new ConflictError(
      "The reference data changed since the preview and some rows are no longer valid. Upload the file again to see why.",
    );
  }
  return parsed.rows;
}
