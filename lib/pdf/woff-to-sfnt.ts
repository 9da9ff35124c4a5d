import { inflateSync } from "node:zlib";

/**
 * Unpacks a WOFF 1.0 font into the plain TrueType/OpenType file it wraps (W3C WOFF File Format
 * 1.0, sections 4–5): the same tables, each inflated, behind an sfnt header. The PDF renderer
 * reads glyphs from an unpacked font directly, where a WOFF makes it inflate the whole glyph
 * table again for every character it embeds.
 */
export function woffToSfnt(woff: Uint8Array): Buffer {
  const input = Buffer.from(woff.buffer, woff.byteOffset, woff.byteLength);
  if (input.length < 44 || input.toString("latin1", 0, 4) !== "wOFF") throw new Error("Not a WOFF 1.0 font.");
  const flavor = input.readUInt32BE(4);
  const numTables = input.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const entry = 44 + i * 20;
    const tag = input.readUInt32BE(entry);
    const offset = input.readUInt32BE(entry + 4);
    const compLength = input.readUInt32BE(entry + 8);
    const origLength = input.readUInt32BE(entry + 12);
    const checksum = input.readUInt32BE(entry + 16);
    if (offset + compLength > input.length) throw new Error("The WOFF font is truncated.");
    const stored = input.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(stored) : Buffer.from(stored);
    if (data.length !== origLength) throw new Error("A WOFF table does not inflate to its stated length.");
    tables.push({ tag, checksum, data });
  }
  // Table records are sorted by tag in an sfnt (WOFF keeps them so, but make sure).
  tables.sort((a, b) => a.tag - b.tag);
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  const headerLength = 12 + numTables * 16;
  const padded = (n: number) => (n + 3) & ~3;
  const total = headerLength + tables.reduce((sum, t) => sum + padded(t.data.length), 0);
  const out = Buffer.alloc(total);
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLength;
  tables.forEach((table, i) => {
    const record = 12 + i * 16;
    out.writeUInt32BE(table.tag, record);
    out.writeUInt32BE(table.checksum, record + 4);
    out.writeUInt32BE(offset, record + 8);
    out.writeUInt32BE(table.data.length, record + 12);
    table.data.copy(out, offset);
    offset += padded(table.data.length);
  });
  return out;
}
