import { sequelize } from "../../db/sequelize";
import { UploadModel } from "../../models/upload";
import { NotFoundError, ConflictError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { loadCurrentDays } from "../observations/observations.repository";
import { storePackedFile } from "./stored-bytes";
import { forgetCheckedRows, keepCheckedRows } from "./preview-cache";
import type { ReceivedFile } from "./receiving-storage";
import {
  assertCsvFileName,
  checkedParse,
  duplicateError,
  findCommittedTwin,
  receiveWhole,
  type Reference,
} from "./upload-files";
import { classify, dateRange, restatedDays } from "../../../shared/ingest/row-plan";
import {
  RESTATED_DAYS_SHOWN,
  type RestatedDayView,
  type RowError,
  type SignedOffQuarter,
  type UploadPreview,
  type UploadSummary,
} from "../../../shared/schemas/upload";
import { signedOffDays } from "./signed-off-days";
import { config } from "../../config";
import type { SignedIn } from "../../kit/actor";
import { emailsById } from "../../kit/lookups";

// An upload's story before and after its commit (upload-commit.ts): the preview of a checked file,
// the history, one upload, and discarding a preview.

/**
 * How many row errors a preview returns. The parse keeps the first KEPT_ERRORS (stored with the
 * upload; the rows endpoint pages through them) and counts all of them (errorCount).
 */
export const PREVIEW_ERROR_CAP = 200;

export interface IncomingFile {
  originalName: string;
  bytes: Buffer;
  /** Set when the file was worked on while it arrived (the upload route). */
  received?: ReceivedFile<Reference>;
}

/** The e-mail of each uploader and committer of these uploads, read once. */
async function peopleOf(rows: readonly UploadModel[]): Promise<Map<number, string>> {
  return emailsById(rows.flatMap((r) => [r.uploadedBy, r.committedBy]));
}

/** When a preview made at `createdAt` stops being committable (config.uploads.previewTtlHours later). */
export function previewExpiry(createdAt: Date): Date {
  return new Date(createdAt.getTime() + config.uploads.previewTtlHours * 3_600_000);
}

async function toPreview(row: UploadModel, people?: ReadonlyMap<number, string>): Promise<UploadPreview> {
  const known = people ?? (await peopleOf([row]));
  const emailOf = (id: number | null) => (id === null ? null : (known.get(id) ?? "unknown"));
  const summary = row.summaryJson
    ? (JSON.parse(row.summaryJson) as {
        portfolios: string[];
        from: string | null;
        to: string | null;
        errorCount: number;
        restatedDays?: RestatedDayView[];
        signedOffRestatements?: number;
        signedOffQuarters?: (SignedOffQuarter & { days: number })[];
      })
    : null;
  const expiresAt = row.status === "preview" ? previewExpiry(row.createdAt) : null;
  const errors = row.errorsJson ? (JSON.parse(row.errorsJson) as RowError[]) : [];
  return {
    id: row.id,
    status: row.status,
    fileName: row.fileName,
    sha256: row.sha256,
    rows: row.rowCount,
    valid: row.validCount,
    invalid: row.invalidCount,
    newRows: row.newCount,
    restatements: row.restatedCount,
    unchanged: row.unchangedCount,
    errors: errors.slice(0, PREVIEW_ERROR_CAP),
    errorCount: summary?.errorCount ?? errors.length,
    portfolios: summary?.portfolios ?? [],
    from: summary?.from ?? null,
    to: summary?.to ?? null,
    uploadedBy: emailOf(row.uploadedBy)!,
    uploadedAt: row.createdAt.toISOString(),
    committedAt: row.committedAt ? row.committedAt.toISOString() : null,
    committedBy: emailOf(row.committedBy),
    inserted: row.insertedCount,
    restatedDays: summary?.restatedDays ?? [],
    signedOffRestatements: summary?.signedOffRestatements ?? 0,
    signedOffQuarters: summary?.signedOffQuarters ?? [],
    expiresAt: expiresAt ? expiresAt.toISOString() : null,
    expired: expiresAt !== null && expiresAt.getTime() <= Date.now(),
  };
}

/** Checks a file and keeps it as a preview: nothing reaches the observations yet. */
export async function previewUpload(file: IncomingFile, actor: SignedIn): Promise<UploadPreview> {
  const fileName = assertCsvFileName(file.originalName);
  // Received over HTTP, the file was hashed, compressed and parsed as it arrived; otherwise now.
  const received = file.received ?? (await receiveWhole(file.bytes));
  const { sha256, ref } = received;
  const twin = await findCommittedTwin(sha256);
  if (twin) throw duplicateError(twin);

  const parsed = checkedParse(received.parse);
  const range = dateRange(parsed.rows);
  const portfolioCodes = [...new Set(parsed.rows.map((r) => r.portfolio))].sort();
  const stored = range
    ? await loadCurrentDays(
        portfolioCodes.map((c) => ref.ids.get(c)!),
        range.from,
        range.to,
      )
    : new Map();
  const { fresh, restated, unchanged } = classify(parsed.rows, ref.ids, stored, false);
  const invalid = parsed.invalidCount;
  // Each restated day, old → new per changed cell, and whether its quarter is signed off (checked again at commit).
  const restatement = restatedDays(parsed.rows, ref.ids, stored, RESTATED_DAYS_SHOWN);
  const signedOff = await signedOffDays(restatement.keys);
  const shownDays: RestatedDayView[] = restatement.detail.map((d) => ({
    portfolio: d.portfolio,
    date: d.date,
    changes: d.changes,
    signedOff: signedOff.quarterOf(d.portfolioId, d.date),
  }));

  const row = await sequelize.transaction(async (transaction) => {
    const created = await UploadModel.create(
      {
        fileName,
        sha256,
        committedSha256: null,
        sizeBytes: file.bytes.length,
        content: null,
        uploadedBy: actor.user.id,
        status: "preview",
        rowCount: parsed.totalRows,
        validCount: parsed.totalRows - invalid,
        invalidCount: invalid,
        newCount: fresh,
        restatedCount: restated,
        unchangedCount: unchanged,
        insertedCount: null,
        errorsJson: JSON.stringify(parsed.errors),
        summaryJson: JSON.stringify({
          portfolios: portfolioCodes,
          from: range?.from ?? null,
          to: range?.to ?? null,
          errorCount: parsed.errorCount,
          restatedDays: shownDays,
          signedOffRestatements: signedOff.count,
          signedOffQuarters: signedOff.quarters,
        }),
        committedAt: null,
      },
      { transaction },
    );
    await storePackedFile(created.id, await received.packed, transaction);
    await recordAudit(
      actor,
      "upload.preview",
      `upload #${created.id}`,
      { after: { fileName, sha256, rows: parsed.totalRows, invalid, restated } },
      transaction,
    );
    return created;
  });
  if (invalid === 0) keepCheckedRows(row.id, sha256, parsed.rows);
  return toPreview(row);
}

export async function discardUpload(id: number, actor: SignedIn): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const upload = await UploadModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!upload) throw new NotFoundError(`No upload #${id}.`);
    if (upload.status !== "preview")
      throw new ConflictError(`Upload #${id} is ${upload.status}; only a preview can be discarded.`);
    upload.status = "discarded";
    upload.content = null;
    await upload.save({ transaction });
    await recordAudit(actor, "upload.discard", `upload #${id}`, {}, transaction);
  });
  forgetCheckedRows(id);
}

export async function listUploads(): Promise<UploadSummary[]> {
  const rows = await UploadModel.findAll({ order: [["id", "DESC"]], limit: 200 });
  const people = await peopleOf(rows);
  const previews = await Promise.all(rows.map((r) => toPreview(r, people)));
  return previews.map(({ errors: _errors, restatedDays: _days, ...rest }) => rest);
}

export async function getUpload(id: number): Promise<UploadPreview> {
  const row = await UploadModel.findByPk(id);
  if (!row) throw new NotFoundError(`No upload #${id}.`);
  return toPreview(row);
}
