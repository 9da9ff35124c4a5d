// Plain words for owners: dates, assembly descriptions and certificate codes, shared by the
// owner portal, the notice e-mails, the letters and the certificate. Pure.
import { assemblyKindLabels, isAssemblyKind, type AssemblyKind } from "@/lib/rules";

const monthNames = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

/**
 * "2026-03-03" → "3 March 2026". Read from the digits, never through Date, so no time zone can
 * move it by a day.
 */
export function formatLongDate(isoDate: string): string {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) throw new Error(`Not a calendar date: ${JSON.stringify(isoDate)}`);
  const month = monthNames[Number(match[2]) - 1];
  if (!month) throw new Error(`Not a calendar date: ${JSON.stringify(isoDate)}`);
  return `${Number(match[3])} ${month} ${match[1]}`;
}

/** "Reduced pressure principle assembly (RP)". */
export function kindWithCode(kind: string): string {
  return isAssemblyKind(kind) ? `${assemblyKindLabels[kind]} (${kind})` : kind;
}

/** An air gap is inspected and measured, the other kinds are gauge-tested. */
export function checkWordFor(kind: string): "test" | "inspection" {
  return (kind as AssemblyKind) === "AG" ? "inspection" : "test";
}

/** "the kitchen branch line" style place of an assembly, or a neutral phrase when none is recorded. */
export function assemblyPlace(location: string): string {
  const trimmed = location.trim();
  return trimmed ? trimmed : "its recorded location";
}

/** One line that names an assembly for its owner: kind, make/model and serial. */
export function describeAssembly(assembly: { kind: string; make?: string; model?: string; serial?: string; size?: string }): string {
  const parts = [kindWithCode(assembly.kind)];
  const makeModel = [assembly.make, assembly.model].filter((part) => part && part.trim()).join(" ");
  if (makeModel) parts.push(makeModel);
  if (assembly.size?.trim()) parts.push(assembly.size.trim());
  if (assembly.serial?.trim()) parts.push(`serial ${assembly.serial.trim()}`);
  return parts.join(", ");
}

/** Only the last characters of a serial, for public pages: enough to match paper, not to look it up. */
export function serialTail(serial: string, visible = 4): string {
  const trimmed = serial.trim();
  if (!trimmed) return "no serial recorded";
  return trimmed.length <= visible ? trimmed : `…${trimmed.slice(-visible)}`;
}

/** Certificate codes are printed in groups of four for reading aloud and typing: "ABCD-EFGH-JKMN". */
export function formatCertificateCode(code: string): string {
  return code.match(/.{1,4}/g)?.join("-") ?? code;
}

/** The readable-code alphabet (no 0/O, 1/I/L look-alikes), as lib/auth/tokens generates. */
const READABLE_CODE = /^[ABCDEFGHJKMNPQRSTUVWXYZ23456789]+$/;

/**
 * A typed or scanned code in canonical form (upper case, no spaces or dashes), or null when it
 * cannot be one of ours. Look-alike letters are not "corrected": a wrong code is simply not found.
 */
export function normalizeReadableCode(input: unknown, length: number): string | null {
  if (typeof input !== "string" || input.length > 64) return null;
  const compact = input.replace(/[\s-]+/g, "").toUpperCase();
  return compact.length === length && READABLE_CODE.test(compact) ? compact : null;
}

/** One-time sign-in codes on letters are 10 characters, printed "ABCDE-FGHJK". */
export const OWNER_CODE_LENGTH = 10;

export function formatOwnerCode(code: string): string {
  return `${code.slice(0, 5)}-${code.slice(5)}`;
}
