import { inflateSync } from "node:zlib";

/**
 * A WOFF 1.0 font unpacked to the plain TrueType/OpenType (sfnt) it wraps (W3C WOFF 1.0 §4–§5),
 * with Node's own zlib. pdfkit's font library inflates WOFF tables in pure JavaScript on every
 * access, which made one pack take most of a second; an unpacked font embeds the same glyphs.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString("latin1", 0, 4) !== "wOFF") throw new Error("not a WOFF 1.0 font");
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const stored = woff.subarray(offset, offset + compLength);
    tables.push({
      tag: woff.readUInt32BE(at),
      checksum: woff.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(stored) : Buffer.from(stored),
    });
  }
  const pad4 = (n: number) => (n + 3) & ~3;
  let size = 12 + 16 * numTables;
  for (const t of tables) size += pad4(t.data.length);
  const out = Buffer.alloc(size);
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let dataAt = 12 + 16 * numTables;
  tables.forEach((t, i) => {
    const rec = 12 + i * 16;
    out.writeUInt32BE(t.tag, rec);
    out.writeUInt32BE(t.checksum, rec + 4);
    out.writeUInt32BE(dataAt, rec + 8);
    out.writeUInt32BE(t.data.length, rec + 12);
    t.data.copy(out, dataAt);
    dataAt += pad4(t.data.length);
  });
  return out;
}
