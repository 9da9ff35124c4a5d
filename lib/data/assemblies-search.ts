import "server-only";
import { and, asc, eq, inArray, like, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { unionAll } from "drizzle-orm/mysql-core";
import { assemblies, programs, sites } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { ConflictError, InputError, NotFoundError } from "@/lib/errors";
import { isIsoDate, type AssemblyKind } from "@/lib/rules";
import { recordAudit } from "./audit";
import { recomputeAssemblyFacts } from "./assembly-facts";
import { prepared } from "./prepared";
import { listApprovedProgramIds, requireApprovedProgram } from "./tester-programs";

export type MatchedOn = "serial" | "account" | "address" | "site_name";

export interface AssemblySearchHit {
  id: number;
  programId: number;
  programName: string;
  kind: AssemblyKind;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  status: "active" | "awaiting_confirmation" | "removed" | "replaced";
  lastTestedOn: string | null;
  lastOutcome: "pass" | "fail" | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
  site: { id: number; name: string; addressLine1: string; city: string; accountNumber: string };
  matchedOn: MatchedOn;
}

export const SEARCH_MIN_LENGTH = 2;
const PER_QUERY_LIMIT = 20;
const RESULT_LIMIT = 25;

/** A LIKE prefix pattern with the user's %, _ and \ taken literally. */
export function prefixPattern(text: string): string {
  return `${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** Program ids the actor may search: a tester's approved programs (or one of them), staff their own. */
async function searchScope(actor: Actor, programId: number | undefined): Promise<number[]> {
  if (actor.role === "tester") {
    const approved = await listApprovedProgramIds(actor);
    if (programId === undefined) return approved;
    if (!approved.includes(programId)) throw new NotFoundError("You are not approved to test in that program.");
    return [programId];
  }
  if (actor.programId === null) return [];
  if (programId !== undefined && programId !== actor.programId) throw new NotFoundError("No such program.");
  return [actor.programId];
}

export const assemblySearchSchema = z.object({
  q: z.string().trim().max(60, { message: "Search with at most 60 characters." }).default(""),
  program: z.coerce.number().int().positive().optional(),
});

const hitColumns = {
  id: assemblies.id,
  programId: assemblies.programId,
  programName: programs.shortName,
  kind: assemblies.kind,
  make: assemblies.make,
  model: assemblies.model,
  size: assemblies.size,
  serial: assemblies.serial,
  location: assemblies.location,
  status: assemblies.status,
  lastTestedOn: assemblies.lastTestedOn,
  lastOutcome: assemblies.lastOutcome,
  nextDueOn: assemblies.nextDueOn,
  repairDueOn: assemblies.repairDueOn,
  // Named apart from assemblies.id: the branches are joined by UNION, whose columns need distinct names.
  siteId: sql<number>`${sites.id}`.as("site_id"),
  siteName: sites.name,
  addressLine1: sites.addressLine1,
  city: sites.city,
  accountNumber: sites.accountNumber,
};

/**
 * The search for a number of programs, prepared once per number: one branch per program and
 * per column, ordered by the column it matches, so each reads its LIMIT rows straight off a
 * (program_id, column) index range and stops, however many thousands of serials share the typed
 * prefix. Ordering by anything else, or spanning two programs in one branch, would make the
 * database gather and sort every match. The branches go as one UNION ALL statement: one round
 * trip to the database for the whole search.
 */
function buildAssemblySearch(programCount: number) {
  const db = getDb();
  const pattern = sql.placeholder("pattern");
  const inService = inArray(assemblies.status, ["active", "awaiting_confirmation"]);
  const branch = (programIndex: number, column: typeof assemblies.serial | typeof sites.accountNumber | typeof sites.addressLine1 | typeof sites.name, matchedOn: MatchedOn) => {
    const programId = sql.placeholder(`program${programIndex}`);
    return (
      db
        .select({ ...hitColumns, matchedOn: sql<MatchedOn>`${matchedOn}`.as("matched_on") })
        // Left to itself the optimizer walks the serial index from the program's first serial
        // (a "ref" on program_id) instead of seeking to the prefix: the hint makes it a range.
        .from(assemblies, column === assemblies.serial ? { forceIndex: "assemblies_serial_idx" } : undefined)
        .innerJoin(sites, eq(sites.id, assemblies.siteId))
        .innerJoin(programs, eq(programs.id, assemblies.programId))
        .where(and(column === assemblies.serial ? eq(assemblies.programId, programId) : eq(sites.programId, programId), like(column, pattern), inService))
        .orderBy(asc(column))
        .limit(PER_QUERY_LIMIT)
    );
  };
  const columns = [
    [assemblies.serial, "serial"],
    [sites.accountNumber, "account"],
    [sites.addressLine1, "address"],
    [sites.name, "site_name"],
  ] as const;
  const programIndexes = Array.from({ length: programCount }, (_, i) => i);
  // Four columns, so always at least two branches.
  const [first, second, ...others] = columns.flatMap(([column, matchedOn]) => programIndexes.map((i) => branch(i, column, matchedOn)));
  return unionAll(first!, second!, ...others).prepare();
}

/**
 * Assemblies by serial, account number, street address or site name, as the tester types.
 * Every branch is a prefix match on an indexed (program_id, column) pair, so each answers
 * from an index range however large the inventory; removed and replaced assemblies are left out.
 */
export async function searchAssemblies(actor: Actor, input: z.infer<typeof assemblySearchSchema>): Promise<{ hits: AssemblySearchHit[]; query: string }> {
  assertCan(actor, "assemblies.search");
  const query = input.q;
  const scope = await searchScope(actor, input.program);
  if (query.length < SEARCH_MIN_LENGTH || scope.length === 0) return { hits: [], query };
  const statement = prepared(`search.assemblies|${scope.length}`, () => buildAssemblySearch(scope.length));
  const rows = await statement.execute({ pattern: prefixPattern(query), ...Object.fromEntries(scope.map((programId, i) => [`program${i}`, programId])) });
  // Serial matches first, then account, address and site name, each in its column's order.
  const rank: Record<MatchedOn, number> = { serial: 0, account: 1, address: 2, site_name: 3 };
  const ordered = rows.map((row, index) => ({ row, index })).sort((a, b) => rank[a.row.matchedOn] - rank[b.row.matchedOn] || a.index - b.index);
  const seen = new Set<number>();
  const hits: AssemblySearchHit[] = [];
  for (const { row } of ordered) {
    if (seen.has(row.id) || hits.length >= RESULT_LIMIT) continue;
    seen.add(row.id);
    const { siteId, siteName, addressLine1, city, accountNumber, ...hit } = row;
    hits.push({ ...hit, site: { id: siteId, name: siteName, addressLine1, city, accountNumber } });
  }
  return { hits, query };
}

export interface SiteSearchHit {
  id: number;
  programId: number;
  name: string;
  addressLine1: string;
  city: string;
  accountNumber: string;
  hazard: "severe" | "high" | "low";
}

/** Sites by account number, street address or name (prefix, indexed), to register an assembly at. */
export async function searchSites(actor: Actor, input: z.infer<typeof assemblySearchSchema>): Promise<{ hits: SiteSearchHit[]; query: string }> {
  assertCan(actor, "assemblies.search");
  const query = input.q;
  const scope = await searchScope(actor, input.program);
  if (query.length < SEARCH_MIN_LENGTH || scope.length === 0) return { hits: [], query };
  const pattern = prefixPattern(query);
  const run = (column: typeof sites.accountNumber | typeof sites.addressLine1 | typeof sites.name) =>
    getDb()
      .select({ id: sites.id, programId: sites.programId, name: sites.name, addressLine1: sites.addressLine1, city: sites.city, accountNumber: sites.accountNumber, hazard: sites.hazard })
      .from(sites)
      .where(and(inArray(sites.programId, scope), like(column, pattern), eq(sites.isActive, true)))
      .orderBy(asc(column))
      .limit(RESULT_LIMIT);
  // One indexed prefix look-up per column (an OR across them would scan the program's sites).
  const lists = await Promise.all([run(sites.accountNumber), run(sites.addressLine1), run(sites.name)]);
  const seen = new Set<number>();
  const hits: SiteSearchHit[] = [];
  for (const row of lists.flat()) {
    if (seen.has(row.id) || hits.length >= RESULT_LIMIT) continue;
    seen.add(row.id);
    hits.push(row);
  }
  return { hits, query };
}

export const assemblyRegistrationSchema = z
  .object({
    programId: z.number({ message: "Pick the program." }).int().positive(),
    siteId: z.number({ message: "Pick the site the assembly is at." }).int().positive(),
    kind: z.enum(["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"], { message: "Pick the kind of assembly." }),
    make: z.string().trim().max(80).default(""),
    model: z.string().trim().max(80).default(""),
    size: z.string().trim().max(20, { message: "Write the size briefly, e.g. 3/4 in." }).default(""),
    serial: z.string().trim().max(60).default(""),
    location: z.string().trim().min(3, { message: "Say where on the site it is, e.g. meter vault at the street." }).max(200),
    installedOn: z.string().refine(isIsoDate, { message: "Enter the installation date (YYYY-MM-DD)." }).nullable().default(null),
    notes: z.string().trim().max(500).default(""),
  })
  .superRefine((value, context) => {
    if (value.kind !== "AG") {
      if (value.serial === "") context.addIssue({ code: "custom", path: ["serial"], message: "Enter the serial number from the data plate." });
      if (value.make === "") context.addIssue({ code: "custom", path: ["make"], message: "Enter the make from the data plate." });
      if (value.size === "") context.addIssue({ code: "custom", path: ["size"], message: "Enter the size, e.g. 3/4 in." });
    }
  });

/**
 * A newly installed assembly registered from the field. It waits for the inspector's
 * confirmation ("awaiting_confirmation", with who registered it); its first report can be
 * filed at once.
 */
export async function registerAssemblyFromField(actor: Actor, input: z.infer<typeof assemblyRegistrationSchema>): Promise<{ id: number }> {
  assertCan(actor, "assemblies.register");
  const program = await requireApprovedProgram(actor, input.programId);
  if (input.installedOn && input.installedOn > program.today) throw new InputError("The installation date cannot be after today.", { installedOn: ["The installation date cannot be after today."] });
  return getDb().transaction(async (tx) => {
    const [site] = await tx
      .select({ id: sites.id, hazard: sites.hazard, addressLine1: sites.addressLine1 })
      .from(sites)
      .where(and(eq(sites.id, input.siteId), eq(sites.programId, program.id)))
      .limit(1);
    if (!site) throw new InputError("That site is not in this program's inventory.", { siteId: ["Pick a site from the search."] });
    if (input.serial !== "") {
      const [twin] = await tx
        .select({ id: assemblies.id, addressLine1: sites.addressLine1 })
        .from(assemblies)
        .innerJoin(sites, eq(sites.id, assemblies.siteId))
        .where(and(eq(assemblies.programId, program.id), eq(assemblies.serial, input.serial), inArray(assemblies.status, ["active", "awaiting_confirmation"]), input.make ? eq(assemblies.make, input.make) : sql`TRUE`))
        .limit(1);
      if (twin) throw new ConflictError(`An assembly with serial ${input.serial} is already in the inventory at ${twin.addressLine1}: find it by its serial and test that one.`, "duplicate_assembly");
    }
    const now = new Date();
    const [row] = await tx
      .insert(assemblies)
      .values({
        programId: program.id,
        siteId: site.id,
        kind: input.kind,
        make: input.make,
        model: input.model,
        size: input.size,
        serial: input.serial,
        location: input.location,
        hazard: site.hazard,
        installedOn: input.installedOn,
        status: "awaiting_confirmation",
        registeredBy: actor.id,
        notes: input.notes || null,
        baseState: "inactive",
        createdAt: now,
        updatedAt: now,
      })
      .$returningId();
    const id = row!.id;
    await recordAudit(tx, { programId: program.id, actorId: actor.id, action: "assembly.registered_from_field", entityType: "assembly", entityId: id, after: input });
    await recomputeAssemblyFacts(tx, id);
    return { id };
  });
}

export interface TagAssembly {
  id: number;
  tagNumber: string;
  kind: AssemblyKind;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  addressLine1: string;
  city: string;
  programName: string;
}

/** The number printed on an assembly's tag: the program's prefix and the assembly's id. */
export function formatTagNumber(reportPrefix: string, assemblyId: number): string {
  return `${reportPrefix}-A${String(assemblyId).padStart(6, "0")}`;
}

export const MAX_TAGS_PER_SHEET = 60;

/** Assemblies for a tag sheet, each one the actor may see; any other id makes the whole request "not found". */
export async function listAssembliesForTags(actor: Actor, ids: readonly number[]): Promise<TagAssembly[]> {
  assertCan(actor, "tags.print");
  const unique = [...new Set(ids)];
  if (unique.length === 0) throw new InputError("Pick at least one assembly.", { ids: ["Pick at least one assembly."] });
  if (unique.length > MAX_TAGS_PER_SHEET) throw new InputError(`At most ${MAX_TAGS_PER_SHEET} tags at a time.`, { ids: [`At most ${MAX_TAGS_PER_SHEET} tags at a time.`] });
  const scope = await searchScope(actor, undefined);
  const rows = scope.length
    ? await getDb()
        .select({ id: assemblies.id, kind: assemblies.kind, make: assemblies.make, model: assemblies.model, size: assemblies.size, serial: assemblies.serial, location: assemblies.location, addressLine1: sites.addressLine1, city: sites.city, programName: programs.shortName, prefix: programs.reportPrefix })
        .from(assemblies)
        .innerJoin(sites, eq(sites.id, assemblies.siteId))
        .innerJoin(programs, eq(programs.id, assemblies.programId))
        .where(and(inArray(assemblies.id, unique), inArray(assemblies.programId, scope)))
    : [];
  if (rows.length !== unique.length) throw new NotFoundError("Some of those assemblies are not in your programs.");
  const byId = new Map(rows.map((r) => [r.id, r]));
  return unique.map((id) => {
    const { prefix, ...row } = byId.get(id)!;
    return { ...row, tagNumber: formatTagNumber(prefix, id) };
  });
}
