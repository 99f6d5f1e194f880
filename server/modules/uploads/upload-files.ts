import { createHash } from "node:crypto";
import { Op, type Transaction } from "sequelize";
import type { StorageEngine } from "multer";
import { UploadModel } from "../../models/upload";
import { PortfolioModel } from "../../models/portfolio";
import { EntityModel } from "../../models/entity";
import { HolidayModel } from "../../models/holiday";
import { AppError, ConflictError } from "../../errors";
import { plainFileName } from "../../kit/file-name";
import { packBytesInBackground } from "./stored-bytes";
import { receivingStorage, type ReceivedFile } from "./receiving-storage";
import {
  CsvFileError,
  decodeCsvBytes,
  EXAMPLE_PORTFOLIO,
  parseObservationCsv,
  serialiseObservationCsv,
  type CsvReferenceData,
  type ParsedCsv,
} from "../../../shared/ingest/parse-csv";
import { ALL_COLUMNS, AMOUNT_COLUMNS, type AmountColumn } from "../../../shared/schemas/upload";

// The daily file itself: its name, the reference data it is checked against, its parse, and
// whether the same bytes were committed before.

export function assertCsvFileName(name: string): string {
  plainFileName(name);
  if (!/\.csv$/i.test(name)) throw new AppError(415, "unsupported_media_type", "Only .csv files are accepted.");
  return name;
}

/** Every portfolio a file may name, with its entity's holiday calendar. */
export type Reference = CsvReferenceData & { ids: Map<string, number> };

export async function loadReferenceData(transaction?: Transaction): Promise<Reference> {
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
export function checkedParse(parse: () => ParsedCsv): ParsedCsv {
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

export const parseFile = (bytes: Buffer, ref: CsvReferenceData) =>
  checkedParse(() => parseObservationCsv(decodeCsvBytes(bytes), ref));

/** What receiving a file over HTTP does as it arrives (receiving-storage.ts), done at once for a file in hand. */
export async function receiveWhole(bytes: Buffer): Promise<ReceivedFile<Reference>> {
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

export async function findCommittedTwin(sha256: string, exceptId?: number): Promise<UploadModel | null> {
  return UploadModel.findOne({
    where: { committedSha256: sha256, ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}) },
  });
}

export function duplicateError(twin: UploadModel): ConflictError {
  return new ConflictError(
    `This exact file was already committed as upload #${twin.id} (${twin.fileName}, ${twin.committedAt?.toISOString().slice(0, 16).replace("T", " ")} UTC).`,
    { uploadId: twin.id },
  );
}

/** The header and two example rows an analyst can fill in. */
export function templateCsv(): string {
  const example = (date: string, a: number, h: number) => ({
    ...(Object.fromEntries(AMOUNT_COLUMNS.map((c) => [c, null])) as Record<AmountColumn, null>),
    portfolio: EXAMPLE_PORTFOLIO,
    date,
    actual_pnl: a,
    hypothetical_pnl: h,
    var_99: 4200000,
    var_975: 3500000,
    svar_99: 9800000,
  });
  return serialiseObservationCsv(
    [example("2026-09-29", -1250000.5, -1180000), example("2026-09-30", 860000, 910250.25)],
    ALL_COLUMNS,
  );
}
