/** File types recognised by their first bytes, never by the name or the browser's claim. */
export type SniffedType = "application/pdf" | "image/png" | "image/jpeg" | "text/csv";

export function sniffFileType(bytes: Uint8Array): SniffedType | null {
  const starts = (...sig: number[]) => sig.every((b, i) => bytes[i] === b);
  if (starts(0x25, 0x50, 0x44, 0x46, 0x2d)) return "application/pdf"; // %PDF-
  if (starts(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a)) return "image/png";
  if (starts(0xff, 0xd8, 0xff)) return "image/jpeg";
  if (looksLikeText(bytes)) return "text/csv";
  return null;
}

/** UTF-8 (a BOM allowed) with no NUL or other binary control bytes in the first 64 KB. */
function looksLikeText(bytes: Uint8Array): boolean {
  const sample = bytes.subarray(0, 65536);
  for (const b of sample) if (b === 0 || (b < 0x09) || (b > 0x0d && b < 0x20 && b !== 0x1b)) return false;
  try {
    new TextDecoder("utf-8", { fatal: true }).decode(sample.length === bytes.length ? sample : trimToCharBoundary(sample));
    return true;
  } catch {
    return false;
  }
}

function trimToCharBoundary(sample: Uint8Array): Uint8Array {
  let end = sample.length;
  // Step back over a multi-byte character cut at the sample's end.
  while (end > 0 && end > sample.length - 4 && (sample[end - 1]! & 0xc0) === 0x80) end--;
  if (end > 0 && sample[end - 1]! >= 0xc0) end--;
  return sample.subarray(0, end);
}
