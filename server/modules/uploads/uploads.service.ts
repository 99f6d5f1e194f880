import { createHash } from "node:crypto";
import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { lockPortfolios } from "../../db/portfolio-locks";
import { UploadModel } from "../../models/upload";
import { UserModel } from "../../models/user";
import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { HolidayModel } from "../../models/holiday";
import { AppError, ConflictError, NotFoundError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import {
  PipelinedWrites,
  loadCurrentDays,
  queueInsertVersions,
  INSERT_BATCH_ROWS,
  queueRetireVersions,
  type NewVersion,
  type QualityDay,
  type StoredDay,
  type VersionKey,
} from "../observations/observations.repository";
import { applyFindings, checkFindings, loadFindingInputs } from "../findings/findings.service";
import { packBytesInBackground, storePackedFile, unpackBytes } from "./stored-bytes";
import type { StorageEngine } from "multer";
import { receivingStorage, type ReceivedFile } from "./receiving-storage";
import { checkedRowsOf, forgetCheckedRows, keepCheckedRows } from "./preview-cache";
import { flagChangedSnapshots } from "../snapshots/snapshots.restatements";
import { plainFileName } from "../../http/file-name";
import {
  CsvFileError,
  decodeCsvBytes,
  parseObservationCsv,
  recheckReferenceData,
  serialiseObservationCsv,
  splitCsv,
  type CsvReferenceData,
  type ParsedCsv,
  type ParsedRow,
} from "../../../shared/ingest/parse-csv";
import {
  AMOUNT_COLUMNS,
  ALL_COLUMNS,
  type AmountColumn,
  type CommitResult,
  type RowError,
  type UploadPreview,
  type UploadRowsPage,
  type UploadSummary,
} from "../../../shared/schemas/upload";
import type { Actor } from "../../http/context";
import type { SessionUser } from "../../../shared/schemas/auth";

type SignedIn = Actor & { user: SessionUser };

/** How many row errors a preview returns (all are counted; the rows endpoint pages through them). */
export const PREVIEW_ERROR_CAP = 200;
const STORED_ERROR_CAP = 20_000;

export interface IncomingFile {
  originalName: string;
  bytes: Buffer;
  /** Set when the file was worked on while it arrived (the upload route). */
  received?: ReceivedFile<Reference>;
}

function assertCsvFileName(name: string): string {
  plainFileName(name);
  if (!/\.csv$/i.test(name)) throw new AppError(415, "unsupported_media_type", "Only .csv files are accepted.");
  return name;
}

/** Every portfolio a file may name, with its entity's holiday calendar. */
type Reference = CsvReferenceData & { ids: Map<string, number> };

async function loadReferenceData(transaction?: Transaction): Promise<Reference> {
  const portfolios = await PortfolioModel.findAll({ include: [{ model: EntityModel, as: "entity" }], transaction });
  const holidays = await HolidayModel.findAll({ transaction });
  const byEntity = new Map<number, Map<string, string>>();
  for (const h of holidays) {
    if (!byEntity.has(h.entityId)) byEntity.set(h.entityId, new Map());
    byEntity.get(h.entityId)!.set(h.date, h.name);
  }
  const ref = new Map<string, { entityCode: string; holidays: ReadonlyMap<string, string> }>();
  const ids = new Map<string, number>();
  for (const p of portfolios) {
    const entity = (p as unknown as { entity: EntityModel }).entity;
    ref.set(p.code, { entityCode: entity.code, holidays: byEntity.get(entity.id) ?? new Map() });
    ids.set(p.code, p.id);
  }
  return { portfolios: ref, ids };
}

/** A parse, with a file refused as a whole answered as the API's error. */
function checkedParse(parse: () => ParsedCsv): ParsedCsv {
  try {
    return parse();
  } catch (err) {
    if (err instanceof CsvFileError)
      throw new AppError(err.status, err.status === 415 ? "unsupported_media_type" : "invalid_file", err.message, {
        errors: err.errors,
      });
    throw err;
  }
}

const parseFile = (bytes: Buffer, ref: CsvReferenceData) =>
  checkedParse(() => parseObservationCsv(decodeCsvBytes(bytes), ref));

/** What receiving a file over HTTP does as it arrives (receiving-storage.ts), done at once for a file in hand. */
async function receiveWhole(bytes: Buffer): Promise<ReceivedFile<Reference>> {
  const ref = await loadReferenceData();
  const packed = packBytesInBackground(bytes); // on libuv's threads while this one parses
  packed.catch(() => undefined);
  return {
    sha256: createHash("sha256").update(bytes).digest("hex"),
    packed,
    ref,
    parse: () => parseObservationCsv(decodeCsvBytes(bytes), ref),
  };
}

/** The storage the upload route receives files with: hashed, compressed and parsed as they arrive. */
export function uploadStorage(): StorageEngine {
  return receivingStorage(loadReferenceData);
}

const sameValues = (stored: Record<AmountColumn, number | null>, row: ParsedRow) =>
  AMOUNT_COLUMNS.every((c) => (stored[c] ?? null) === (row[c] ?? null));

/**
 * Sorts valid rows into new days, restatements (a changed day) and unchanged days; with
 * `writes`, also lists what to write (the preview only counts).
 */
function classify(rows: readonly ParsedRow[], ids: Map<string, number>, stored: Map<string, StoredDay>, writes = true) {
  const inserts: NewVersion[] = [];
  const retire: VersionKey[] = [];
  let fresh = 0;
  let restated = 0;
  let unchanged = 0;
  let lastCode = "";
  let portfolioId = 0;
  for (const row of rows) {
    if (row.portfolio !== lastCode) {
      lastCode = row.portfolio;
      portfolioId = ids.get(row.portfolio)!;
    }
    const current = stored.size ? stored.get(`${portfolioId}|${row.date}`) : undefined;
    if (!current) {
      fresh++;
      if (writes) inserts.push({ portfolioId, version: 1, row });
    } else if (sameValues(current.values, row)) {
      unchanged++;
    } else {
      restated++;
      if (writes) {
        retire.push({ portfolioId, date: row.date, version: current.version });
        inserts.push({ portfolioId, version: current.version + 1, row });
      }
    }
  }
  return { inserts, retire, fresh, restated, unchanged };
}

/** Each portfolio's current days inside the committed span once the commit is written: the file's days, and the stored days it leaves as they are. */
function currentDaysInSpan(
  rows: readonly ParsedRow[],
  ids: Map<string, number>,
  stored: Map<string, StoredDay>,
): Map<number, QualityDay[]> {
  const byPortfolio = new Map<number, QualityDay[]>();
  const daysOf = (pid: number) => {
    let days = byPortfolio.get(pid);
    if (!days) byPortfolio.set(pid, (days = []));
    return days;
  };
  const written = new Set<string>();
  let lastCode = "";
  let days: QualityDay[] = [];
  let portfolioId = 0;
  for (const r of rows) {
    if (r.portfolio !== lastCode) {
      lastCode = r.portfolio;
      portfolioId = ids.get(r.portfolio)!;
      days = daysOf(portfolioId);
    }
    days.push({
      date: r.date,
      actualPnl: r.actual_pnl ?? null,
      hypotheticalPnl: r.hypothetical_pnl ?? null,
      var99: r.var_99 ?? null,
    });
    if (stored.size) written.add(`${portfolioId}|${r.date}`);
  }
  for (const [key, day] of stored) {
    if (!written.has(key))
      daysOf(day.portfolioId).push({
        date: day.date,
        actualPnl: day.values.actual_pnl,
        hypotheticalPnl: day.values.hypothetical_pnl,
        var99: day.values.var_99,
      });
  }
  return byPortfolio;
}

function dateRange(rows: readonly ParsedRow[]): { from: string; to: string } | null {
  if (rows.length === 0) return null;
  let from = rows[0].date;
  let to = rows[0].date;
  for (const r of rows) {
    if (r.date < from) from = r.date;
    if (r.date > to) to = r.date;
  }
  return { from, to };
}

/** The span of days and the portfolios (ids, sorted) the rows write, in one pass. */
function spanOf(
  rows: readonly ParsedRow[],
  ids: ReadonlyMap<string, number>,
): { range: { from: string; to: string } | null; portfolioIds: number[] } {
  const portfolioIds = new Set<number>();
  let lastCode: string | undefined;
  for (const r of rows) {
    if (r.portfolio === lastCode) continue;
    lastCode = r.portfolio;
    portfolioIds.add(ids.get(r.portfolio)!);
  }
  return { range: dateRange(rows), portfolioIds: [...portfolioIds].sort((a, b) => a - b) };
}

async function findCommittedTwin(sha256: string, exceptId?: number): Promise<UploadModel | null> {
  return UploadModel.findOne({
    where: { committedSha256: sha256, ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}) },
  });
}

function duplicateError(twin: UploadModel): ConflictError {
  return new ConflictError(
    `This exact file was already committed as upload #${twin.id} (${twin.fileName}, ${twin.committedAt?.toISOString().slice(0, 16).replace("T", " ")} UTC).`,
    { uploadId: twin.id },
  );
}

/** The e-mail of each uploader and committer of these uploads, read once. */
async function peopleOf(rows: readonly UploadModel[]): Promise<Map<number, string>> {
  const ids = [
    ...new Set(rows.flatMap((r) => (r.committedBy === null ? [r.uploadedBy] : [r.uploadedBy, r.committedBy]))),
  ];
  return new Map(
    (await UserModel.findAll({ where: { id: ids }, attributes: ["id", "email"] })).map((u) => [u.id, u.email]),
  );
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
      })
    : null;
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
  };
}

/** Portfolio ids the preview named (from its summary), sorted. */
async function previewPortfolioIds(upload: UploadModel, transaction: Transaction): Promise<number[]> {
  const codes: string[] = upload.summaryJson ? JSON.parse(upload.summaryJson).portfolios : [];
  if (codes.length === 0) return [];
  const found = await PortfolioModel.findAll({ where: { code: codes }, attributes: ["id"], transaction });
  return found.map((p) => p.id).sort((a, b) => a - b);
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
  const invalid = parsed.invalidLines.size;

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
        errorsJson: JSON.stringify(parsed.errors.slice(0, STORED_ERROR_CAP)),
        summaryJson: JSON.stringify({
          portfolios: portfolioCodes,
          from: range?.from ?? null,
          to: range?.to ?? null,
          errorCount: parsed.errors.length,
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

/**
 * Writes a clean preview's rows in one transaction: restated days get a new version and keep
 * the old one; the same file can be committed only once (unique committed_sha256). The rows are
 * sent as pipelined multi-row INSERTs, and the data-quality checks run while MariaDB writes them.
 */
export async function commitUpload(id: number, actor: SignedIn): Promise<CommitResult> {
  const result = await sequelize.transaction(async (transaction) => {
    const upload = await UploadModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!upload) throw new NotFoundError(`No upload #${id}.`);
    if (upload.status === "committed") throw new ConflictError(`Upload #${id} is already committed.`);
    if (upload.status === "discarded") throw new ConflictError(`Upload #${id} was discarded; upload the file again.`);
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
    await recordAudit(
      actor,
      "upload.commit",
      `upload #${id}`,
      { after: { inserted: inserts.length, restated, unchanged, sha256: upload.sha256 } },
      transaction,
    );
    return { id, status: "committed" as const, inserted: inserts.length, restated, unchanged };
  });
  forgetCheckedRows(id);
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
  if (parsed.errors.length) {
    throw new ConflictError(
      "The reference data changed since the preview and some rows are no longer valid. Upload the file again to see why.",
    );
  }
  return parsed.rows;
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
  return previews.map(({ errors: _errors, ...rest }) => rest);
}

export async function getUpload(id: number): Promise<UploadPreview> {
  const row = await UploadModel.findByPk(id);
  if (!row) throw new NotFoundError(`No upload #${id}.`);
  return toPreview(row);
}

/** A page of the uploaded file's rows as text, each with its errors: the preview table. */
export async function getUploadRows(
  id: number,
  query: { offset: number; limit: number; invalidOnly: boolean },
): Promise<UploadRowsPage> {
  const upload = await UploadModel.scope("withContent").findByPk(id);
  if (!upload) throw new NotFoundError(`No upload #${id}.`);
  if (!upload.content) throw new ConflictError(`Upload #${id} was discarded; its rows are no longer kept.`);
  const text = decodeCsvBytes(unpackBytes(upload.content));
  const data = splitCsv(text).data;
  const columns = (data[0] ?? []).map((h) => h.trim().toLowerCase());
  const errors = upload.errorsJson ? (JSON.parse(upload.errorsJson) as RowError[]) : [];
  const byLine = new Map<number, RowError[]>();
  for (const e of errors) {
    if (!byLine.has(e.line)) byLine.set(e.line, []);
    byLine.get(e.line)!.push(e);
  }
  const lines: { line: number; cells: Record<string, string>; errors: RowError[] }[] = [];
  for (let i = 1; i < data.length; i++) {
    const cells = data[i];
    if (cells.length === 1 && cells[0].trim() === "") continue;
    const line = i + 1;
    const lineErrors = byLine.get(line) ?? [];
    if (query.invalidOnly && lineErrors.length === 0) continue;
    const record: Record<string, string> = {};
    columns.forEach((c, j) => {
      record[c] = cells[j] ?? "";
    });
    lines.push({ line, cells: record, errors: lineErrors });
  }
  return { columns, rows: lines.slice(query.offset, query.offset + query.limit), total: lines.length };
}

/** The header and two example rows an analyst can fill in. */
export function templateCsv(): string {
  const example = (date: string, a: number, h: number) => ({
    portfolio: "LKS-EU-TOTAL",
    date,
    actual_pnl: a,
    hypothetical_pnl: h,
    var_99: 4200000,
    var_975: 3500000,
    svar_99: 9800000,
    var_10d: null,
    svar_10d: null,
    es_975: null,
    ses: null,
    rtpl: null,
  });
  return serialiseObservationCsv(
    [example("2026-09-29", -1250000.5, -1180000), example("2026-09-30", 860000, 910250.25)],
    ALL_COLUMNS,
  );
}
