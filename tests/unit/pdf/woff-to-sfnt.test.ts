// The shipped WOFF fonts unpack to sfnt files whose every table matches the checksum the WOFF
// recorded for it, at the size the WOFF says the original file had.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { woffToSfnt } from "@/lib/pdf/woff-to-sfnt";

const dir = path.join(process.cwd(), "node_modules", "@fontsource", "source-sans-3", "files");
const fonts = readdirSync(dir).filter((f) => /^source-sans-3-latin(-ext)?-(400|600|700)-(normal|italic)\.woff$/.test(f));

/** The sfnt table checksum: the sum of its big-endian 32-bit words (head: with checkSumAdjustment as 0). */
function tableChecksum(data: Buffer, isHead: boolean): number {
  const padded = Buffer.alloc((data.length + 3) & ~3);
  data.copy(padded);
  if (isHead) padded.writeUInt32BE(0, 8);
  let sum = 0;
  for (let i = 0; i < padded.length; i += 4) sum = (sum + padded.readUInt32BE(i)) >>> 0;
  return sum;
}

describe("woffToSfnt", () => {
  test("the fonts the PDFs use are there", () => {
    expect(fonts.length).toBeGreaterThanOrEqual(8);
  });

  test.each(fonts)("%s", (name) => {
    const woff = readFileSync(path.join(dir, name));
    const sfnt = woffToSfnt(woff);
    expect(sfnt.length).toBe(woff.readUInt32BE(16)); // totalSfntSize
    expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4)); // flavor
    const numTables = sfnt.readUInt16BE(4);
    expect(numTables).toBe(woff.readUInt16BE(12));
    let previousTag = -1;
    for (let i = 0; i < numTables; i++) {
      const record = 12 + i * 16;
      const tag = sfnt.readUInt32BE(record);
      const checksum = sfnt.readUInt32BE(record + 4);
      const offset = sfnt.readUInt32BE(record + 8);
      const length = sfnt.readUInt32BE(record + 12);
      expect(tag).toBeGreaterThan(previousTag);
      previousTag = tag;
      expect(offset % 4).toBe(0);
      const tagName = sfnt.toString("latin1", record, record + 4);
      expect(tableChecksum(sfnt.subarray(offset, offset + length), tagName === "head"), tagName).toBe(checksum);
    }
  });

  test("refuses what is not a WOFF font", () => {
    expect(() => woffToSfnt(Buffer.from("not a font at all, just some words here to make it long enough"))).toThrow(/WOFF/);
    const woff = readFileSync(path.join(dir, fonts[0]!));
    expect(() => woffToSfnt(woff.subarray(0, 200))).toThrow(/truncated/);
  });
});
