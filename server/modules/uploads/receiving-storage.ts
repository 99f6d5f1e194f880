import { createHash } from "node:crypto";
import { createGzip } from "node:zlib";
import type { StorageEngine } from "multer";
import { CsvByteStream, type CsvReferenceData, type ParsedCsv } from "../../../shared/ingest/parse-csv";
import { PACK_LEVEL } from "./stored-bytes";

/** What the upload has done with a file by the time it is all there. */
export interface ReceivedFile<Ref extends CsvReferenceData = CsvReferenceData> {
  sha256: string;
  /** The file gzip-compressed for keeping (as packBytes), finishing on libuv's threads. */
  packed: Promise<Buffer>;
  /** The reference data the file was checked against. */
  ref: Ref;
  /** The whole file's parse (refusals throw CsvFileError, as parseObservationCsv's). */
  parse(): ParsedCsv;
}

/**
 * A multer storage engine that keeps the file in memory, as multer's own memory storage does,
 * and works on it while it arrives: each piece is hashed, compressed and parsed as it comes
 * (shared/ingest/parse-csv.ts, CsvByteStream), so that the preview has little left to do once
 * the last byte is in. The reference data is read before the first piece is taken. multer's
 * limits still apply: a file over the size limit is refused by multer and nothing here is kept.
 */
export function receivingStorage<Ref extends CsvReferenceData>(loadReferenceData: () => Promise<Ref>): StorageEngine {
  return {
    _handleFile(_req, file, done) {
      file.stream.pause();
      loadReferenceData().then((ref) => {
        const chunks: Buffer[] = [];
        let size = 0;
        const hash = createHash("sha256");
        const parse = new CsvByteStream(ref);
        const gzip = createGzip({ level: PACK_LEVEL, chunkSize: 256 * 1024 });
        const packedChunks: Buffer[] = [];
        gzip.on("data", (c: Buffer) => packedChunks.push(c));
        const packed = new Promise<Buffer>((resolve, reject) => {
          gzip.on("end", () => resolve(Buffer.concat(packedChunks)));
          gzip.on("error", reject);
        });
        packed.catch(() => undefined); // awaited by the preview; a refused file never gets there
        file.stream.on("data", (chunk: Buffer) => {
          chunks.push(chunk);
          size += chunk.length;
          hash.update(chunk);
          gzip.write(chunk);
          parse.push(chunk);
        });
        file.stream.on("error", (err: Error) => {
          gzip.destroy();
          done(err);
        });
        file.stream.on("end", () => {
          gzip.end();
          const buffer = Buffer.concat(chunks, size);
          const received: ReceivedFile<Ref> = {
            sha256: hash.digest("hex"),
            packed,
            ref,
            parse: () => parse.end(buffer),
          };
          done(null, { buffer, size, received } as Partial<Express.Multer.File>);
        });
        file.stream.resume();
      }, done);
    },
    _removeFile(_req, file, done) {
      delete (file as Partial<Express.Multer.File>).buffer;
      delete (file as { received?: unknown }).received;
      done(null);
    },
  };
}
