import "server-only";
import { and, asc, eq, inArray, isNull, ne, or } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, reportDrafts, sites, testReports, users } from "@/db/schema";
import { assemblyKinds, hazards } from "@/db/schema/inventory";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { ConflictError, InputError, NotFoundError } from "@/lib/errors";
import { familyOf, type ComplianceState } from "@/lib/rules";
import { recomputeAssemblyFacts } from "./assembly-facts";
import { recordAudit } from "./audit";
import { hasKindMismatch, stateOf, warningsForAssembly } from "./inventory-rules";
import { loadAssemblyHistory, type AssemblyHistory } from "./review-history";
import { getProgramContext } from "./settings";

const optionalText = (max: number, label: string) => z.string().trim().max(max, `${label}: at most ${max} characters.`).optional().default("");
const optionalDate = z
  .union([z.literal(""), z.iso.date("Write the date as YYYY-MM-DD.")])
  .optional()
  .transform((v) => v || null);

export const assemblySchema = z.object({
  kind: z.enum(assemblyKinds, { message: "Choose the kind of assembly." }),
  make: optionalText(80, "Make"),
  model: optionalText(80, "Model"),
  size: optionalText(20, "Size"),
  serial: optionalText(60, "Serial"),
  location: optionalText(200, "Location"),
  hazard: z.enum(hazards, { message: "Choose the degree of hazard." }),
  backpressurePossible: z.boolean().optional().default(false),
  installedOn: optionalDate,
  notes: optionalText(2000, "Notes"),
});
export type AssemblyInput = z.infer<typeof assemblySchema>;

export interface AssemblyDetail {
  id: number;
  siteId: number;
  site: { accountNumber: string; name: string; address: string; hazard: string; facilityType: string };
  kind: (typeof assemblyKinds)[number];
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  hazard: (typeof hazards)[number];
  backpressurePossible: boolean;
  installedOn: string | null;
  status: "active" | "awaiting_confirmation" | "removed" | "replaced";
  removedOn: string | null;
  replacedBy: { id: number; label: string } | null;
  replaces: { id: number; label: string }[];
  mergedIntoId: number | null;
  registeredBy: string | null;
  notes: string;
  lastTestedOn: string | null;
  lastOutcome: string | null;
  lastPassedOn: string | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
  noticeStage: string | null;
  state: ComplianceState;
  warnings: string[];
  isMismatch: boolean;
  history: AssemblyHistory;
  units: "psid" | "kPa";
  today: string;
}

const labelOf = (a: { kind: string; serial: string; location: string }) => [a.kind, a.serial ? `serial ${a.serial}` : "no serial", a.location].filter(Boolean).join(" · ");

async function assemblyInProgramOrThrow(programId: number, id: number) {
  const [row] = await getDb().select().from(assemblies).where(and(eq(assemblies.id, id), eq(assemblies.programId, programId))).limit(1);
  if (!row) throw new NotFoundError("No such assembly in your program.");
  return row;
}

export async function getAssemblyForStaff(actor: Actor, id: number): Promise<AssemblyDetail> {
  assertCan(actor, "inventory.view");
  const context = await getProgramContext(staffProgramId(actor));
  const a = await assemblyInProgramOrThrow(context.id, id);
  const db = getDb();
  const [[site], replacements, [registrar], [replacedBy], history] = await Promise.all([
    db.select().from(sites).where(eq(sites.id, a.siteId)).limit(1),
    db.select({ id: assemblies.id, kind: assemblies.kind, serial: assemblies.serial, location: assemblies.location }).from(assemblies).where(eq(assemblies.replacedById, a.id)),
    a.registeredBy ? db.select({ name: users.name }).from(users).where(eq(users.id, a.registeredBy)).limit(1) : Promise.resolve([]),
    a.replacedById ? db.select({ id: assemblies.id, kind: assemblies.kind, serial: assemblies.serial, location: assemblies.location }).from(assemblies).where(eq(assemblies.id, a.replacedById)).limit(1) : Promise.resolve([]),
    loadAssemblyHistory(a.id, a.kind, context.ruleSet, context.settings.units),
  ]);
  const isInService = a.status === "active" || a.status === "awaiting_confirmation";
  return {
    id: a.id,
    siteId: a.siteId,
    site: { accountNumber: site?.accountNumber ?? "", name: site?.name ?? "", address: site ? [site.addressLine1, site.addressLine2, site.city].filter(Boolean).join(", ") : "", hazard: site?.hazard ?? "", facilityType: site?.facilityType ?? "" },
    kind: a.kind,
    make: a.make,
    model: a.model,
    size: a.size,
    serial: a.serial,
    location: a.location,
    hazard: a.hazard,
    backpressurePossible: a.backpressurePossible,
    installedOn: a.installedOn,
    status: a.status,
    removedOn: a.removedOn,
    replacedBy: replacedBy ? { id: replacedBy.id, label: labelOf(replacedBy) } : null,
    replaces: replacements.map((r) => ({ id: r.id, label: labelOf(r) })),
    mergedIntoId: a.mergedIntoId,
    registeredBy: registrar?.name ?? null,
    notes: a.notes ?? "",
    lastTestedOn: a.lastTestedOn,
    lastOutcome: a.lastOutcome,
    lastPassedOn: a.lastPassedOn,
    nextDueOn: a.nextDueOn,
    repairDueOn: a.repairDueOn,
    noticeStage: a.noticeStage,
    state: stateOf(a, context.today, context.rules),
    warnings: isInService ? warningsForAssembly(a) : [],
    isMismatch: isInService && hasKindMismatch(a),
    history,
    units: context.settings.units,
    today: context.today,
  };
}

function assemblyValues(input: AssemblyInput) {
  return {
    kind: input.kind,
    make: input.make,
    model: input.model,
    size: input.size,
    serial: input.serial,
    location: input.location,
    hazard: input.hazard,
    backpressurePossible: input.backpressurePossible,
    installedOn: input.installedOn,
    notes: input.notes || null,
  };
}

/** Another active assembly of the program with the same make and serial (a likely duplicate). */
async function findSerialClash(programId: number, input: { make: string; serial: string }, exceptId?: number) {
  if (!input.serial) return null;
  const [clash] = await getDb()
    .select({ id: assemblies.id })
    .from(assemblies)
    .where(and(eq(assemblies.programId, programId), eq(assemblies.make, input.make), eq(assemblies.serial, input.serial), isNull(assemblies.mergedIntoId), inArray(assemblies.status, ["active", "awaiting_confirmation"]), exceptId ? ne(assemblies.id, exceptId) : undefined))
    .limit(1);
  return clash ?? null;
}

function serialClashError(id: number): InputError {
  return new InputError(`Assembly #${id} already has this make and serial: open it instead, or correct the serial.`, { serial: [`Assembly #${id} already has this make and serial.`] });
}

export async function createAssembly(actor: Actor, siteId: number, input: AssemblyInput): Promise<{ id: number }> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  const [site] = await getDb().select({ id: sites.id }).from(sites).where(and(eq(sites.id, siteId), eq(sites.programId, programId))).limit(1);
  if (!site) throw new NotFoundError("No such site in your program.");
  const clash = await findSerialClash(programId, input);
  if (clash) throw serialClashError(clash.id);
  const now = new Date();
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(assemblies)
      .values({ programId, siteId, ...assemblyValues(input), status: "active", createdAt: now, updatedAt: now })
      .$returningId();
    await recomputeAssemblyFacts(tx, row!.id);
    await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.created", entityType: "assembly", entityId: row!.id, after: { siteId, ...assemblyValues(input) } });
    return { id: row!.id };
  });
}

/** Edits an assembly's record; its facts are recomputed (installation date and hazard move due dates). */
export async function updateAssembly(actor: Actor, id: number, input: AssemblyInput): Promise<void> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  const clash = await findSerialClash(programId, input, id);
  if (clash) throw serialClashError(clash.id);
  await getDb().transaction(async (tx) => {
    const [current] = await tx.select().from(assemblies).where(and(eq(assemblies.id, id), eq(assemblies.programId, programId))).for("update");
    if (!current) throw new NotFoundError("No such assembly in your program.");
    if (current.mergedIntoId) throw new ConflictError(`This registration was merged into assembly #${current.mergedIntoId}: edit that one.`);
    const values = assemblyValues(input);
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(values)) {
      const old = current[key as keyof typeof current] ?? null;
      if (old !== value) {
        before[key] = old;
        after[key] = value;
      }
    }
    if (Object.keys(after).length === 0) return;
    await tx.update(assemblies).set({ ...values, updatedAt: new Date() }).where(eq(assemblies.id, id));
    await recomputeAssemblyFacts(tx, id);
    await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.updated", entityType: "assembly", entityId: id, before, after });
  });
}

export const assemblyStatusSchema = z.discriminatedUnion("action", [
  z.object({ action: z.literal("remove"), on: z.iso.date("Enter the removal date as YYYY-MM-DD."), note: optionalText(500, "Note") }),
  z.object({ action: z.literal("replace"), on: z.iso.date("Enter the replacement date as YYYY-MM-DD."), note: optionalText(500, "Note"), replacement: assemblySchema }),
  z.object({ action: z.literal("reinstate"), note: optionalText(500, "Note") }),
]);
export type AssemblyStatusInput = z.infer<typeof assemblyStatusSchema>;

/**
 * Takes an assembly out of service (removed, or replaced by a new one at the same site) or back
 * into service. Nothing is deleted: its reports and certificates stay, and it simply stops
 * counting as due.
 */
export async function changeAssemblyStatus(actor: Actor, id: number, input: AssemblyStatusInput): Promise<{ replacementId: number | null }> {
  assertCan(actor, "inventory.manage");
  const context = await getProgramContext(staffProgramId(actor));
  const programId = context.id;
  if (input.action !== "reinstate" && input.on > context.today) throw new InputError("The date cannot be in the future.", { on: ["The date cannot be in the future."] });
  if (input.action === "replace") {
    const clash = await findSerialClash(programId, input.replacement);
    if (clash) throw serialClashError(clash.id);
  }
  return getDb().transaction(async (tx) => {
    const [current] = await tx.select().from(assemblies).where(and(eq(assemblies.id, id), eq(assemblies.programId, programId))).for("update");
    if (!current) throw new NotFoundError("No such assembly in your program.");
    if (current.mergedIntoId) throw new ConflictError(`This registration was merged into assembly #${current.mergedIntoId}.`);
    const now = new Date();
    const before = { status: current.status, removedOn: current.removedOn, replacedById: current.replacedById };
    if (input.action === "reinstate") {
      if (current.status !== "removed" && current.status !== "replaced") throw new ConflictError("This assembly is in service already.");
      await tx.update(assemblies).set({ status: "active", removedOn: null, replacedById: null, updatedAt: now }).where(eq(assemblies.id, id));
      await recomputeAssemblyFacts(tx, id);
      await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.reinstated", entityType: "assembly", entityId: id, before, after: { status: "active", note: input.note || null } });
      return { replacementId: null };
    }
    if (current.status !== "active") throw new ConflictError(current.status === "awaiting_confirmation" ? "Confirm or merge this field registration first." : "This assembly is already out of service.");
    if (current.installedOn && input.on < current.installedOn) throw new InputError("The date is before the assembly was installed.", { on: ["The date is before the installation date."] });
    let replacementId: number | null = null;
    if (input.action === "replace") {
      const [row] = await tx
        .insert(assemblies)
        .values({ programId, siteId: current.siteId, ...assemblyValues(input.replacement), installedOn: input.replacement.installedOn ?? input.on, status: "active", createdAt: now, updatedAt: now })
        .$returningId();
      replacementId = row!.id;
      await recomputeAssemblyFacts(tx, replacementId);
      await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.created", entityType: "assembly", entityId: replacementId, after: { siteId: current.siteId, replaces: id, ...assemblyValues(input.replacement) } });
    }
    const notes = input.note ? [current.notes, `${input.on}: ${input.note}`].filter(Boolean).join("\n") : current.notes;
    await tx
      .update(assemblies)
      .set({ status: input.action === "replace" ? "replaced" : "removed", removedOn: input.on, replacedById: replacementId, notes, updatedAt: now })
      .where(eq(assemblies.id, id));
    await recomputeAssemblyFacts(tx, id);
    await recordAudit(tx, { programId, actorId: actor.id, action: input.action === "replace" ? "assembly.replaced" : "assembly.removed", entityType: "assembly", entityId: id, before, after: { status: input.action === "replace" ? "replaced" : "removed", removedOn: input.on, replacedById: replacementId, note: input.note || null } });
    return { replacementId };
  });
}

/** Confirms a tester's field registration (with the inspector's corrections, if any). */
export async function confirmAssembly(actor: Actor, id: number, input: AssemblyInput): Promise<void> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  const clash = await findSerialClash(programId, input, id);
  if (clash) throw new InputError(`Assembly #${clash.id} already has this make and serial: merge the registration into it instead.`, { serial: [`Assembly #${clash.id} already has this make and serial.`] });
  await getDb().transaction(async (tx) => {
    const [current] = await tx.select().from(assemblies).where(and(eq(assemblies.id, id), eq(assemblies.programId, programId))).for("update");
    if (!current) throw new NotFoundError("No such assembly in your program.");
    if (current.status !== "awaiting_confirmation") throw new ConflictError("This assembly is not waiting for confirmation (someone may have decided it already).");
    await tx.update(assemblies).set({ ...assemblyValues(input), status: "active", updatedAt: new Date() }).where(eq(assemblies.id, id));
    await recomputeAssemblyFacts(tx, id);
    await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.confirmed", entityType: "assembly", entityId: id, before: { status: current.status, ...assemblyValues({ ...current, notes: current.notes ?? "" }) }, after: { status: "active", ...assemblyValues(input) } });
  });
}

export const mergeSchema = z.object({ targetId: z.coerce.number().int().positive("Choose the assembly to merge into.") });

/**
 * A field registration that turns out to be an assembly already on file: its reports (and any
 * drafts) move to the existing assembly, both sets of facts are recomputed, and the registration
 * is kept, out of service, pointing at the one it was merged into.
 */
export async function mergeAssembly(actor: Actor, sourceId: number, targetId: number): Promise<{ movedReports: number }> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  if (sourceId === targetId) throw new InputError("Choose a different assembly to merge into.", { targetId: ["An assembly cannot be merged into itself."] });
  return getDb().transaction(async (tx) => {
    // Both rows locked in id order, so two merges touching the same pair cannot deadlock.
    const rows = await tx
      .select()
      .from(assemblies)
      .where(and(eq(assemblies.programId, programId), or(eq(assemblies.id, sourceId), eq(assemblies.id, targetId))))
      .orderBy(asc(assemblies.id))
      .for("update");
    const source = rows.find((r) => r.id === sourceId);
    const target = rows.find((r) => r.id === targetId);
    if (!source) throw new NotFoundError("No such assembly in your program.");
    if (!target) throw new InputError("The assembly to merge into is not in your program.", { targetId: ["No such assembly in your program."] });
    if (source.status !== "awaiting_confirmation") throw new ConflictError("Only a field registration waiting for confirmation can be merged.");
    if (target.status !== "active" || target.mergedIntoId) throw new InputError("Merge into an assembly that is in service.", { targetId: ["That assembly is not in service."] });
    if (familyOf(source.kind) !== familyOf(target.kind)) throw new InputError(`A ${source.kind} registration cannot be merged into a ${target.kind}: the readings would not fit.`, { targetId: ["The kinds do not match."] });
    const moved = await tx.update(testReports).set({ assemblyId: target.id, updatedAt: new Date() }).where(eq(testReports.assemblyId, source.id));
    await tx.update(reportDrafts).set({ assemblyId: target.id, updatedAt: new Date() }).where(eq(reportDrafts.assemblyId, source.id));
    const notes = [source.notes, `Merged into assembly #${target.id}.`].filter(Boolean).join("\n");
    await tx.update(assemblies).set({ status: "removed", mergedIntoId: target.id, notes, updatedAt: new Date() }).where(eq(assemblies.id, source.id));
    await recomputeAssemblyFacts(tx, source.id);
    await recomputeAssemblyFacts(tx, target.id);
    const movedReports = moved[0].affectedRows;
    await recordAudit(tx, { programId, actorId: actor.id, action: "assembly.merged", entityType: "assembly", entityId: source.id, before: { status: source.status }, after: { mergedIntoId: target.id, movedReports } });
    return { movedReports };
  });
}

/** Likely matches for a field registration: same site, or same serial anywhere in the program. */
export async function listMergeCandidates(actor: Actor, sourceId: number): Promise<{ id: number; label: string; siteName: string; isSameSite: boolean }[]> {
  assertCan(actor, "inventory.view");
  const programId = staffProgramId(actor);
  const source = await assemblyInProgramOrThrow(programId, sourceId);
  const rows = await getDb()
    .select({ id: assemblies.id, kind: assemblies.kind, serial: assemblies.serial, location: assemblies.location, siteId: assemblies.siteId, siteName: sites.name })
    .from(assemblies)
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .where(and(eq(assemblies.programId, programId), eq(assemblies.status, "active"), isNull(assemblies.mergedIntoId), ne(assemblies.id, source.id), or(eq(assemblies.siteId, source.siteId), source.serial ? eq(assemblies.serial, source.serial) : undefined)))
    .limit(30);
  return rows
    .filter((r) => familyOf(r.kind) === familyOf(source.kind))
    .map((r) => ({ id: r.id, label: labelOf(r), siteName: r.siteName, isSameSite: r.siteId === source.siteId }));
}
