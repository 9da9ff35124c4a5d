import "server-only";
import Papa from "papaparse";
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import type { Executor } from "@/db/client";
import { assemblies, owners, siteOwners, sites } from "@/db/schema";
import { deriveAssemblyFacts, isIsoDate, type AssemblyKind, type Hazard, type ProgramRules } from "@/lib/rules";
import { recordAudit } from "./audit";
import { importFields, IMPORT_MAX_ROWS, normalizeHeader, type ImportFieldKey, type ImportMapping } from "./import-fields";
import { recomputeFactsForAssemblies } from "./inventory-facts";

/**
 * The inventory importer. Three steps, so a bad file changes nothing and a good one goes in fast:
 *   1. readCsvText: the bytes must be UTF-8 (the line of the first bad byte is reported);
 *   2. parseImportFile + validateRows: every row checked with zod, duplicates inside the file
 *      found, before anything is written;
 *   3. writeChunk: valid rows in chunks of CHUNK_ROWS, each chunk one transaction of bulk
 *      upserts (sites on their account number, owners on e-mail or name, assemblies on make +
 *      serial or on site + location), so re-importing the same file finds every row unchanged.
 * Blank cells leave existing values alone: an import adds and corrects, it never erases.
 */

export const CHUNK_ROWS = 2000;

export class ImportFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ImportFileError";
  }
}

/** Byte offset of the first invalid UTF-8 sequence, or -1. */
function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i]!;
    if (b < 0x80) {
      i++;
      continue;
    }
    const length = b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    if (length === 0 || i + length > bytes.length) return i;
    for (let k = 1; k < length; k++) if ((bytes[i + k]! & 0xc0) !== 0x80) return i;
    if (b === 0xe0 && bytes[i + 1]! < 0xa0) return i;
    if (b === 0xed && bytes[i + 1]! > 0x9f) return i;
    if (b === 0xf0 && bytes[i + 1]! < 0x90) return i;
    if (b === 0xf4 && bytes[i + 1]! > 0x8f) return i;
    i += length;
  }
  return -1;
}

/** The file as text; anything but UTF-8 is refused with the line where it goes wrong. */
export function readCsvText(bytes: Uint8Array): string {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) {
    throw new ImportFileError("The file is saved as UTF-16 text. Save it as “CSV UTF-8” and upload it again.");
  }
  const bad = firstInvalidUtf8(bytes);
  if (bad >= 0) {
    let line = 1;
    for (let i = 0; i < bad; i++) if (bytes[i] === 0x0a) line++;
    throw new ImportFileError(`The file is not UTF-8 text: line ${line} has a character in another encoding (often Windows-1252 from a spreadsheet). Save it as “CSV UTF-8” and upload it again. Nothing was imported.`);
  }
  return new TextDecoder("utf-8").decode(bytes).replace(/^\uFEFF/, "");
}

export interface ParsedFile {
  header: string[];
  /** Data records with their row number in the file (the header is row 1). */
  records: { row: number; cells: string[]; structure: string | null }[];
  emptyLines: number;
}

/** Splits the text into records; checks the header and the mapping against it. */
export function parseImportFile(text: string, mapping: ImportMapping): ParsedFile {
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: false, delimitersToGuess: [",", ";", "\t", "|"] });
  const rows = parsed.data;
  const headerRow = rows[0];
  if (!headerRow || headerRow.every((c) => c.trim() === "")) throw new ImportFileError("The file is empty: the first line must name the columns.");
  const header = headerRow.map((h) => h.replace(/^\uFEFF/, "").trim());
  const seen = new Map<string, number>();
  header.forEach((h, i) => {
    if (!h) return;
    const key = normalizeHeader(h);
    if (seen.has(key)) throw new ImportFileError(`Two columns are named “${h}” (columns ${seen.get(key)! + 1} and ${i + 1}): give each column its own name.`);
    seen.set(key, i);
  });
  const mappedColumns = Object.entries(mapping).filter(([, column]) => column);
  const missing = mappedColumns.filter(([, column]) => !header.includes(column)).map(([, column]) => `“${column}”`);
  if (missing.length) throw new ImportFileError(`The file has no column ${missing.join(", ")}: it does not match the mapping. Check that you uploaded the file you previewed.`);
  for (const field of importFields) if (field.isRequired && !mapping[field.key]) throw new ImportFileError(`Choose the file's column for “${field.label}”: every row needs it.`);
  if (!mapping.kind && (mapping.serial || mapping.make || mapping.location)) throw new ImportFileError("Assembly columns are mapped but “Assembly kind” is not: choose the column that says RP, DC, PVB…");

  const structureErrors = new Map<number, string>();
  for (const error of parsed.errors) {
    if (error.row === undefined || error.row === null || error.code === "UndetectableDelimiter") continue;
    structureErrors.set(error.row, `the row cannot be read (${error.message.toLowerCase()}); a quote may be missing`);
  }
  const width = header.length;
  const records: ParsedFile["records"] = [];
  let emptyLines = 0;
  // The line break that ends the last line is not an empty line of its own.
  const lastIndex = rows.length > 1 && rows.at(-1)!.every((c) => c === "") && /\r?\n$/.test(text) ? rows.length - 1 : rows.length;
  for (let index = 1; index < lastIndex; index++) {
    const cells = rows[index]!;
    if (cells.every((c) => c.trim() === "")) {
      emptyLines++;
      continue;
    }
    // Extra empty cells (a trailing separator) are harmless; anything else means the values have shifted.
    const hasExtraValues = cells.length > width && cells.slice(width).some((c) => c.trim() !== "");
    const shape = cells.length < width || hasExtraValues ? `the row has ${cells.length} values but the header has ${width} columns; a separator or a quote may be missing or extra` : null;
    records.push({ row: index + 1, cells, structure: structureErrors.get(index) ?? shape });
  }
  if (records.length === 0) throw new ImportFileError("The file has a header but no rows to import.");
  if (records.length > IMPORT_MAX_ROWS) throw new ImportFileError(`The file has ${records.length.toLocaleString("en-US")} rows; an import takes at most ${IMPORT_MAX_ROWS.toLocaleString("en-US")}. Split it into parts.`);
  return { header, records, emptyLines };
}

// ------------------------------------------------------------------ one row

const kindWords: Record<string, AssemblyKind> = {
  rp: "RP",
  rpda: "RPDA",
  dc: "DC",
  dcva: "DC",
  dcda: "DCDA",
  pvb: "PVB",
  svb: "SVB",
  ag: "AG",
  "air gap": "AG",
  "reduced pressure principle assembly": "RP",
  "reduced pressure principle detector assembly": "RPDA",
  "double check valve assembly": "DC",
  "double check detector assembly": "DCDA",
  "pressure vacuum breaker": "PVB",
  "spill resistant vacuum breaker": "SVB",
  "spill-resistant vacuum breaker": "SVB",
};
const hazardWords: Record<string, Hazard> = { severe: "severe", "severe health": "severe", high: "high", "high health": "high", health: "high", "high hazard": "high", low: "low", "low hazard": "low", "non-health": "low", "non health": "low" };
const yesNo: Record<string, boolean> = { yes: true, y: true, true: true, "1": true, no: false, n: false, false: false, "0": false };

const text = (max: number, label: string) => z.string().max(max, `${label} is longer than ${max} characters`);

/** A date as the file wrote it: YYYY-MM-DD, or the US MM/DD/YYYY most spreadsheets export. */
function parseDate(value: string): string | null {
  if (isIsoDate(value)) return value;
  const us = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/.exec(value);
  if (us) {
    const iso = `${us[3]}-${us[1]!.padStart(2, "0")}-${us[2]!.padStart(2, "0")}`;
    if (isIsoDate(iso)) return iso;
  }
  return null;
}

const rowSchema = z.object({
  accountNumber: text(40, "The account number").min(1, "The account number is empty"),
  siteName: text(160, "The site name").optional(),
  addressLine1: text(200, "The address").optional(),
  addressLine2: text(200, "Address line 2").optional(),
  city: text(100, "The town").optional(),
  postalCode: text(20, "The postal code").optional(),
  siteHazard: z
    .string()
    .transform((v, ctx) => hazardWords[v.toLowerCase()] ?? (ctx.addIssue({ code: "custom", message: `the site hazard “${v}” is not severe, high or low` }), z.NEVER))
    .optional(),
  facilityType: text(60, "The facility type").optional(),
  contactName: text(120, "The contact name").optional(),
  contactPhone: text(40, "The contact phone").optional(),
  ownerName: text(160, "The owner name").optional(),
  ownerEmail: z
    .string()
    .max(254)
    .transform((v) => v.toLowerCase())
    .pipe(z.email("the owner e-mail is not an e-mail address"))
    .optional(),
  ownerPhone: text(40, "The owner phone").optional(),
  ownerAddress: text(300, "The owner address").optional(),
  kind: z
    .string()
    .transform((v, ctx) => kindWords[v.toLowerCase().replace(/\s+/g, " ")] ?? (ctx.addIssue({ code: "custom", message: `the assembly kind “${v}” is not one of RP, RPDA, DC, DCDA, PVB, SVB, AG` }), z.NEVER))
    .optional(),
  make: text(80, "The make").optional(),
  model: text(80, "The model").optional(),
  size: text(20, "The size").optional(),
  serial: text(60, "The serial").optional(),
  location: text(200, "The location").optional(),
  assemblyHazard: z
    .string()
    .transform((v, ctx) => hazardWords[v.toLowerCase()] ?? (ctx.addIssue({ code: "custom", message: `the assembly hazard “${v}” is not severe, high or low` }), z.NEVER))
    .optional(),
  backpressurePossible: z
    .string()
    .transform((v, ctx) => yesNo[v.toLowerCase()] ?? (ctx.addIssue({ code: "custom", message: `“backpressure possible” must be yes or no, not “${v}”` }), z.NEVER))
    .optional(),
  installedOn: z
    .string()
    .transform((v, ctx) => parseDate(v) ?? (ctx.addIssue({ code: "custom", message: `the installation date “${v}” is not a date (write YYYY-MM-DD or MM/DD/YYYY)` }), z.NEVER))
    .optional(),
  notes: text(2000, "The notes").optional(),
});
export type ImportRowValues = z.infer<typeof rowSchema>;

export interface ValidRow {
  row: number;
  values: ImportRowValues;
  /** Identity of the assembly inside the file: make + serial, or account + location. */
  assemblyKey: string | null;
}

export interface RowProblem {
  row: number;
  cells: string[];
  problems: string[];
}

const siteKeys = ["siteName", "addressLine1", "addressLine2", "city", "postalCode", "siteHazard", "facilityType", "contactName", "contactPhone"] as const;

const fieldLabel = new Map(importFields.map((f) => [f.key, f.label]));

/** Every row through zod, and no assembly twice in one file. Pure. */
export function validateRows(file: ParsedFile, mapping: ImportMapping, today: string): { valid: ValidRow[]; invalid: RowProblem[] } {
  const columnOf = new Map<ImportFieldKey, number>();
  for (const [key, column] of Object.entries(mapping) as [ImportFieldKey, string | undefined][]) if (column) columnOf.set(key, file.header.indexOf(column));
  const valid: ValidRow[] = [];
  const invalid: RowProblem[] = [];
  const firstRowOf = new Map<string, number>();
  for (const record of file.records) {
    if (record.structure) {
      invalid.push({ row: record.row, cells: record.cells, problems: [record.structure] });
      continue;
    }
    const raw: Record<string, string> = {};
    for (const [key, index] of columnOf) {
      const value = (record.cells[index] ?? "").trim();
      if (value !== "") raw[key] = value;
    }
    const result = rowSchema.safeParse(raw);
    if (!result.success) {
      invalid.push({ row: record.row, cells: record.cells, problems: result.error.issues.map((i) => (i.message.startsWith("the ") || i.message.startsWith("“") ? i.message : `${fieldLabel.get(i.path[0] as ImportFieldKey) ?? String(i.path[0])}: ${i.message}`)) });
      continue;
    }
    const values = result.data;
    const problems: string[] = [];
    const hasAssemblyData = Boolean(values.kind || values.serial || values.make || values.model || values.location);
    if (hasAssemblyData && !values.kind) problems.push("the assembly kind is empty (RP, DC, PVB, …)");
    if (values.kind && !values.serial && !values.location) problems.push("an assembly needs a serial or a location on the site, so a re-import can find it again");
    if (values.installedOn && values.installedOn > today) problems.push(`the installation date ${values.installedOn} is in the future`);
    let assemblyKey: string | null = null;
    if (values.kind && problems.length === 0) {
      assemblyKey = values.serial ? `s|${(values.make ?? "").toLowerCase()}|${values.serial.toLowerCase()}` : `l|${values.accountNumber.toLowerCase()}|${values.location!.toLowerCase()}`;
      const earlier = firstRowOf.get(assemblyKey);
      if (earlier !== undefined) problems.push(`the same assembly as row ${earlier} (${values.serial ? "same make and serial" : "same account and location"})`);
      else firstRowOf.set(assemblyKey, record.row);
    }
    if (problems.length) invalid.push({ row: record.row, cells: record.cells, problems });
    else valid.push({ row: record.row, values, assemblyKey });
  }
  // Rows of one account may disagree about the site (a hazard typed differently on two
  // lines): the first value in the file wins for every row, so each import reads the same.
  const siteValuesOf = new Map<string, Partial<ImportRowValues>>();
  for (const row of valid) {
    const key = row.values.accountNumber.toLowerCase();
    const merged = siteValuesOf.get(key) ?? {};
    for (const field of siteKeys) if (merged[field] === undefined && row.values[field] !== undefined) (merged as Record<string, unknown>)[field] = row.values[field];
    siteValuesOf.set(key, merged);
  }
  for (const row of valid) Object.assign(row.values, siteValuesOf.get(row.values.accountNumber.toLowerCase()));
  return { valid, invalid };
}

// ------------------------------------------------------------------ writing one chunk

export interface ChunkResult {
  inserted: number;
  updated: number;
  unchanged: number;
  failed: RowProblem[];
}

interface WriteContext {
  programId: number;
  actorId: number;
  jobId: number;
  rules: ProgramRules;
  today: string;
  /** Rows by number, to put a database-side problem into the error report. */
  cellsOf: (row: number) => string[];
}

type SiteRow = typeof sites.$inferSelect;
type AssemblyRow = typeof assemblies.$inferSelect;

type SiteField = "name" | "addressLine1" | "addressLine2" | "city" | "postalCode" | "hazard" | "facilityType" | "contactName" | "contactPhone";

function siteUpdatesOf(v: ImportRowValues): Partial<Pick<SiteRow, SiteField>> {
  const out: Partial<Pick<SiteRow, SiteField>> = {};
  if (v.siteName) out.name = v.siteName;
  if (v.addressLine1) out.addressLine1 = v.addressLine1;
  if (v.addressLine2) out.addressLine2 = v.addressLine2;
  if (v.city) out.city = v.city;
  if (v.postalCode) out.postalCode = v.postalCode;
  if (v.siteHazard) out.hazard = v.siteHazard;
  if (v.facilityType) out.facilityType = v.facilityType;
  if (v.contactName) out.contactName = v.contactName;
  if (v.contactPhone) out.contactPhone = v.contactPhone;
  return out;
}

/**
 * Writes one chunk of valid rows in the caller's transaction. Sites first (one upsert), then
 * owners and their links, then assemblies (one upsert); existing assemblies whose dates or
 * hazard changed get their facts recomputed, new ones get the facts lib/rules gives an
 * assembly with no test yet.
 */
export async function writeChunk(tx: Executor, rows: ValidRow[], context: WriteContext): Promise<ChunkResult> {
  const now = new Date();
  const failed: RowProblem[] = [];
  const fail = (row: ValidRow, problem: string) => failed.push({ row: row.row, cells: context.cellsOf(row.row), problems: [problem] });
  const outcome = new Map<number, "inserted" | "updated" | "unchanged">();
  const mark = (row: number, result: "inserted" | "updated" | "unchanged") => {
    const current = outcome.get(row);
    if (current === "inserted" || (current === "updated" && result === "unchanged")) return;
    outcome.set(row, result);
  };

  // ---- what is on file: the sites of these accounts and the assemblies with these serials
  const accounts = [...new Set(rows.map((r) => r.values.accountNumber))];
  const existingSites = accounts.length ? await tx.select().from(sites).where(and(eq(sites.programId, context.programId), inArray(sites.accountNumber, accounts))) : [];
  const siteByAccount = new Map(existingSites.map((s) => [s.accountNumber.toLowerCase(), s]));
  const bySerial = new Map<string, AssemblyRow>();
  const serials = [...new Set(rows.filter((r) => r.values.kind).map((r) => r.values.serial).filter((s): s is string => Boolean(s)))];
  if (serials.length) {
    const found = await tx.select().from(assemblies).where(and(eq(assemblies.programId, context.programId), inArray(assemblies.serial, serials), isNull(assemblies.mergedIntoId)));
    // With two on file (an older duplicate), the one in service wins.
    for (const a of found.sort((x, y) => Number(x.status !== "active") - Number(y.status !== "active") || x.id - y.id)) {
      const key = `${a.make.toLowerCase()}|${a.serial.toLowerCase()}`;
      if (!bySerial.has(key)) bySerial.set(key, a);
    }
  }
  const serialMatchOf = (row: ValidRow) => (row.values.kind && row.values.serial ? bySerial.get(`${(row.values.make ?? "").toLowerCase()}|${row.values.serial.toLowerCase()}`) : undefined);
  // A serial on file at another site fails its row before anything is written: the row's site
  // (new or changed) must not go in without its assembly.
  const conflicting = new Set<number>();
  for (const row of rows) {
    const match = serialMatchOf(row);
    if (match && match.siteId !== siteByAccount.get(row.values.accountNumber.toLowerCase())?.id) {
      conflicting.add(row.row);
      fail(row, `make ${match.make || "(none)"} serial ${match.serial} is already on file at another site (assembly #${match.id}); move it in the inventory first, or correct the row`);
    }
  }

  // ---- sites
  const siteWrites = new Map<string, { id: number | null; values: Record<string, unknown>; firstRow: number; isNew: boolean }>();
  const rejectedAccounts = new Set<string>();
  for (const row of rows) {
    if (conflicting.has(row.row)) continue;
    const key = row.values.accountNumber.toLowerCase();
    if (rejectedAccounts.has(key)) {
      fail(row, `the new account ${row.values.accountNumber} needs a site name, an address and a town on its first row`);
      continue;
    }
    const updates = siteUpdatesOf(row.values);
    const existing = siteByAccount.get(key);
    const pending = siteWrites.get(key);
    if (!existing && !pending) {
      if (!updates.name || !updates.addressLine1 || !updates.city) {
        rejectedAccounts.add(key);
        fail(row, `the new account ${row.values.accountNumber} needs a site name, an address and a town`);
        continue;
      }
      siteWrites.set(key, { id: null, isNew: true, firstRow: row.row, values: { programId: context.programId, accountNumber: row.values.accountNumber, name: updates.name, addressLine1: updates.addressLine1, addressLine2: updates.addressLine2 ?? "", city: updates.city, postalCode: updates.postalCode ?? "", hazard: updates.hazard ?? "low", facilityType: updates.facilityType ?? "", contactName: updates.contactName ?? "", contactPhone: updates.contactPhone ?? "", isActive: true, createdAt: now, updatedAt: now } });
      continue;
    }
    if (pending) continue;
    const changed = Object.entries(updates).filter(([k, v]) => existing![k as keyof SiteRow] !== v);
    if (changed.length) siteWrites.set(key, { id: existing!.id, isNew: false, firstRow: row.row, values: { ...existing!, ...Object.fromEntries(changed), updatedAt: now } });
  }
  if (siteWrites.size) {
    await tx
      .insert(sites)
      .values([...siteWrites.values()].map((w) => w.values as typeof sites.$inferInsert))
      .onDuplicateKeyUpdate({ set: { name: sql`VALUES(name)`, addressLine1: sql`VALUES(address_line1)`, addressLine2: sql`VALUES(address_line2)`, city: sql`VALUES(city)`, postalCode: sql`VALUES(postal_code)`, hazard: sql`VALUES(hazard)`, facilityType: sql`VALUES(facility_type)`, contactName: sql`VALUES(contact_name)`, contactPhone: sql`VALUES(contact_phone)`, updatedAt: sql`VALUES(updated_at)` } });
    const created = [...siteWrites.entries()].filter(([, w]) => w.isNew).map(([, w]) => w.values.accountNumber as string);
    if (created.length) for (const s of await tx.select().from(sites).where(and(eq(sites.programId, context.programId), inArray(sites.accountNumber, created)))) siteByAccount.set(s.accountNumber.toLowerCase(), s);
    for (const w of siteWrites.values()) mark(w.firstRow, w.isNew ? "inserted" : "updated");
    for (const [key, w] of siteWrites) if (!w.isNew) siteByAccount.set(key, { ...siteByAccount.get(key)!, ...(w.values as Partial<SiteRow>) });
  }
  const failedRows = new Set(failed.map((f) => f.row));
  const live = rows.filter((r) => !failedRows.has(r.row));
  const siteOf = (row: ValidRow) => siteByAccount.get(row.values.accountNumber.toLowerCase())!;

  // ---- owners
  const ownerRows = live.filter((r) => r.values.ownerName || r.values.ownerEmail);
  if (ownerRows.length) {
    const emails = [...new Set(ownerRows.map((r) => r.values.ownerEmail).filter((e): e is string => Boolean(e)))];
    const byEmail = new Map((emails.length ? await tx.select().from(owners).where(and(eq(owners.programId, context.programId), inArray(owners.email, emails))) : []).map((o) => [o.email!.toLowerCase(), o]));
    const siteIds = [...new Set(ownerRows.map((r) => siteOf(r).id))];
    const linked = siteIds.length ? await tx.select({ siteId: siteOwners.siteId, owner: owners }).from(siteOwners).innerJoin(owners, eq(owners.id, siteOwners.ownerId)).where(inArray(siteOwners.siteId, siteIds)) : [];
    const links = new Set(linked.map((l) => `${l.siteId}|${l.owner.id}`));
    const byNameAtSite = new Map(linked.map((l) => [`${l.siteId}|${l.owner.name.toLowerCase()}`, l.owner]));
    const newOwners = new Map<string, typeof owners.$inferInsert & { rows: number[] }>();
    const pendingLinks: { siteId: number; ownerKey: string; row: number }[] = [];
    for (const row of ownerRows) {
      const site = siteOf(row);
      const v = row.values;
      const existing = v.ownerEmail ? byEmail.get(v.ownerEmail) : byNameAtSite.get(`${site.id}|${(v.ownerName ?? "").toLowerCase()}`);
      if (existing) {
        const next = { name: v.ownerName ?? existing.name, phone: v.ownerPhone ?? existing.phone, mailingAddress: v.ownerAddress ?? existing.mailingAddress };
        if (next.name !== existing.name || next.phone !== existing.phone || next.mailingAddress !== existing.mailingAddress) {
          await tx.update(owners).set({ ...next, updatedAt: now }).where(eq(owners.id, existing.id));
          Object.assign(existing, next);
          mark(row.row, "updated");
        }
        if (!links.has(`${site.id}|${existing.id}`)) {
          await tx.insert(siteOwners).ignore().values({ siteId: site.id, ownerId: existing.id, relation: "owner", receivesNotices: true });
          links.add(`${site.id}|${existing.id}`);
          mark(row.row, "updated");
        }
        continue;
      }
      const ownerKey = v.ownerEmail ? `e|${v.ownerEmail}` : `n|${site.id}|${(v.ownerName ?? "").toLowerCase()}`;
      const pending = newOwners.get(ownerKey);
      if (pending) pending.rows.push(row.row);
      else newOwners.set(ownerKey, { programId: context.programId, name: v.ownerName ?? v.ownerEmail!, email: v.ownerEmail ?? null, phone: v.ownerPhone ?? "", mailingAddress: v.ownerAddress ?? "", createdAt: now, updatedAt: now, rows: [row.row] });
      pendingLinks.push({ siteId: site.id, ownerKey, row: row.row });
    }
    if (newOwners.size) {
      const list = [...newOwners.entries()];
      const ids = await tx
        .insert(owners)
        .values(list.map(([, { rows: _rows, ...o }]) => o))
        .$returningId();
      const idOf = new Map(list.map(([key], i) => [key, ids[i]!.id]));
      const linkValues = new Map<string, typeof siteOwners.$inferInsert>();
      for (const l of pendingLinks) {
        linkValues.set(`${l.siteId}|${idOf.get(l.ownerKey)}`, { siteId: l.siteId, ownerId: idOf.get(l.ownerKey)!, relation: "owner", receivesNotices: true });
        mark(l.row, "updated");
      }
      await tx.insert(siteOwners).ignore().values([...linkValues.values()]);
    }
  }

  // ---- assemblies
  const assemblyRows = live.filter((r) => r.values.kind);
  const byLocation = new Map<string, AssemblyRow>();
  const locationSites = [...new Set(assemblyRows.filter((r) => !r.values.serial).map((r) => siteOf(r).id))];
  if (locationSites.length) {
    const found = await tx.select().from(assemblies).where(and(inArray(assemblies.siteId, locationSites), eq(assemblies.serial, ""), isNull(assemblies.mergedIntoId)));
    for (const a of found) {
      const key = `${a.siteId}|${a.location.toLowerCase()}`;
      if (!byLocation.has(key)) byLocation.set(key, a);
    }
  }
  const inserts: (typeof assemblies.$inferInsert)[] = [];
  const updates: (typeof assemblies.$inferInsert)[] = [];
  const recompute: number[] = [];
  for (const row of assemblyRows) {
    const v = row.values;
    const site = siteOf(row);
    const existing = v.serial ? serialMatchOf(row) : byLocation.get(`${site.id}|${v.location!.toLowerCase()}`);
    if (!existing) {
      const hazard = v.assemblyHazard ?? site.hazard;
      const facts = deriveAssemblyFacts({ status: "active", installedOn: v.installedOn ?? null, hazard, tests: [] }, context.rules);
      inserts.push({ programId: context.programId, siteId: site.id, kind: v.kind!, make: v.make ?? "", model: v.model ?? "", size: v.size ?? "", serial: v.serial ?? "", location: v.location ?? "", hazard, backpressurePossible: v.backpressurePossible ?? false, installedOn: v.installedOn ?? null, status: "active", notes: v.notes ?? null, ...facts, createdAt: now, updatedAt: now });
      mark(row.row, "inserted");
      continue;
    }
    const next: Partial<AssemblyRow> = {};
    if (v.kind && v.kind !== existing.kind) next.kind = v.kind;
    if (v.make && v.make !== existing.make) next.make = v.make;
    if (v.model && v.model !== existing.model) next.model = v.model;
    if (v.size && v.size !== existing.size) next.size = v.size;
    if (v.location && v.location !== existing.location) next.location = v.location;
    if (v.assemblyHazard && v.assemblyHazard !== existing.hazard) next.hazard = v.assemblyHazard;
    if (v.backpressurePossible !== undefined && v.backpressurePossible !== existing.backpressurePossible) next.backpressurePossible = v.backpressurePossible;
    if (v.installedOn && v.installedOn !== existing.installedOn) next.installedOn = v.installedOn;
    if (v.notes && v.notes !== existing.notes) next.notes = v.notes;
    if (Object.keys(next).length === 0) {
      mark(row.row, "unchanged");
      continue;
    }
    updates.push({ ...existing, ...next, updatedAt: now });
    if (next.hazard || next.installedOn) recompute.push(existing.id);
    mark(row.row, "updated");
  }
  for (let i = 0; i < inserts.length; i += 1000) await tx.insert(assemblies).values(inserts.slice(i, i + 1000));
  if (updates.length) {
    await tx
      .insert(assemblies)
      .values(updates)
      .onDuplicateKeyUpdate({ set: { kind: sql`VALUES(kind)`, make: sql`VALUES(make)`, model: sql`VALUES(model)`, size: sql`VALUES(size)`, location: sql`VALUES(location)`, hazard: sql`VALUES(hazard)`, backpressurePossible: sql`VALUES(backpressure_possible)`, installedOn: sql`VALUES(installed_on)`, notes: sql`VALUES(notes)`, updatedAt: sql`VALUES(updated_at)` } });
  }
  if (recompute.length) await recomputeFactsForAssemblies(tx, context.programId, recompute, context.rules);

  let inserted = 0;
  let updated = 0;
  let unchanged = 0;
  const failedNow = new Set(failed.map((f) => f.row));
  for (const row of rows) {
    if (failedNow.has(row.row)) continue;
    const result = outcome.get(row.row) ?? "unchanged";
    if (result === "inserted") inserted++;
    else if (result === "updated") updated++;
    else unchanged++;
  }
  if (inserted + updated > 0) {
    await recordAudit(tx, { programId: context.programId, actorId: context.actorId, action: "inventory.imported", entityType: "import_job", entityId: context.jobId, after: { rows: `${rows[0]!.row}–${rows.at(-1)!.row}`, inserted, updated, unchanged, failed: failed.length } });
  }
  return { inserted, updated, unchanged, failed };
}
