import "server-only";
import { and, asc, eq, max, ne } from "drizzle-orm";
import { cache } from "react";
import { z } from "zod";
import { getDb } from "@/db/client";
import { localRuleSets, programs, programSettings, returnReasons } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { InputError, NotFoundError, isDuplicateKey } from "@/lib/errors";
import { noticeScheduleFromSettings, programRulesFromSettings, ruleSetForEdition, todayInZone } from "@/lib/programs/settings";
import {
  publishedRuleSets,
  ruleSetById,
  ruleSetValuePaths,
  structuredCloneRuleSet,
  validateNoticeSchedule,
  validateProgramRules,
  validateRuleSet,
  valueAtPath,
  type NoticeSchedule,
  type ProgramRules,
  type RuleSet,
  type RuleSetSourceKey,
  type RuleSetValuePath,
} from "@/lib/rules";
import { recordAudit } from "./audit";
import { runPendingFactsRecompute } from "./inventory-facts";

export type ProgramSettingsRow = typeof programSettings.$inferSelect;

/** Everything the staff pages need to know about their program, once per request. */
export interface ProgramContext {
  id: number;
  name: string;
  shortName: string;
  timezone: string;
  replyToEmail: string;
  contactEmail: string;
  phone: string;
  mailingAddress: string;
  settings: ProgramSettingsRow;
  rules: ProgramRules;
  schedule: NoticeSchedule;
  ruleSet: RuleSet;
  /** "Today" in the program's time zone: every compliance comparison is against this. */
  today: string;
}

export const getProgramContext = cache(async (programId: number): Promise<ProgramContext> => {
  const db = getDb();
  const [row] = await db.select({ program: programs, settings: programSettings }).from(programs).innerJoin(programSettings, eq(programSettings.programId, programs.id)).where(eq(programs.id, programId)).limit(1);
  if (!row) throw new NotFoundError("No such program.");
  const locals = await db.select({ edition: localRuleSets.edition, data: localRuleSets.data }).from(localRuleSets).where(eq(localRuleSets.programId, programId));
  const { program, settings } = row;
  return {
    id: program.id,
    name: program.name,
    shortName: program.shortName,
    timezone: program.timezone,
    replyToEmail: program.replyToEmail,
    contactEmail: program.contactEmail,
    phone: program.phone,
    mailingAddress: program.mailingAddress,
    settings,
    rules: programRulesFromSettings(settings),
    schedule: noticeScheduleFromSettings(settings),
    ruleSet: ruleSetForEdition(settings.ruleSetEdition, locals),
    today: todayInZone(program.timezone),
  };
});

/** The staff member's own program. */
export function getStaffProgramContext(actor: Actor): Promise<ProgramContext> {
  return getProgramContext(staffProgramId(actor));
}

// ------------------------------------------------------------------ settings

const monthDay = z
  .string()
  .trim()
  .regex(/^\d{2}-\d{2}$/, "Write the day as MM-DD, e.g. 05-31.");
const days = (label: string, min: number, max: number) =>
  z.coerce
    .number({ message: `${label}: enter a whole number of days.` })
    .int(`${label}: enter a whole number of days.`)
    .min(min, `${label}: at least ${min}.`)
    .max(max, `${label}: at most ${max}.`);
/** Notice days: whole numbers; order, overlap and negatives are judged by lib/rules with its own messages. */
const noticeDays = z.coerce.number({ message: "Enter a whole number of days." }).int("Enter a whole number of days.");

export const settingsSchema = z.object({
  testIntervalMonths: z.coerce.number().int("Enter a whole number of months.").min(1, "At least 1 month.").max(120, "At most 120 months."),
  dueModel: z.enum(["anniversary", "window"], { message: "Choose the anniversary or the yearly window model." }),
  windowStart: monthDay,
  windowEnd: monthDay,
  dueSoonDays: days("Due soon", 0, 366),
  repairDaysSevere: days("Repair deadline, severe hazard", 1, 366),
  repairDaysHigh: days("Repair deadline, high hazard", 1, 366),
  repairDaysLow: days("Repair deadline, low hazard", 1, 366),
  reportDeadlineDays: days("Report deadline", 0, 366),
  reminderDaysBefore: noticeDays,
  overdueDaysAfter: noticeDays,
  finalDaysAfter: noticeDays,
  repairReminderDaysBefore: noticeDays,
  /** The final notice names the date after which service may be discontinued, this many days on. */
  discontinueDaysAfterFinal: days("Service may be discontinued after the final notice", 0, 366),
  filingFeeCents: z.coerce.number().int("The filing fee is a whole number of cents.").min(0, "The filing fee cannot be negative.").max(1_000_000, "The filing fee is at most 10,000.00."),
  currency: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z]{3}$/, "Use a three-letter currency code such as USD."),
  units: z.enum(["psid", "kPa"], { message: "Choose psid or kPa." }),
  ruleSetEdition: z.string().trim().min(1, "Choose the rule-set edition in force.").max(60),
  kitPolicy: z.enum(["refuse", "flag"], { message: "Choose whether a stale kit verification refuses the report or flags it." }),
});
export type SettingsInput = z.infer<typeof settingsSchema>;

/** Settings that move stored due dates or repair deadlines: changing one recomputes every assembly. */
const dueAffecting = ["testIntervalMonths", "dueModel", "windowStart", "windowEnd", "repairDaysSevere", "repairDaysHigh", "repairDaysLow"] as const;

export interface RuleSetEditionOption {
  edition: string;
  label: string;
  isPublished: boolean;
  basedOn: string | null;
  adoptedOn: string | null;
  variances: { path: string; reason: string }[];
}

export interface SettingsView {
  programName: string;
  settings: SettingsInput;
  editions: RuleSetEditionOption[];
  updatedAt: string;
  /** When a settings change asked for due dates to be recomputed and that is not finished yet. */
  factsPendingSince: string | null;
  recompute: RecomputeStatus;
}

/** Where the recompute of due dates a settings change asked for has got to. */
export interface RecomputeStatus {
  /** Set while one is owed. */
  pendingSince: string | null;
  done: number;
  total: number;
  /** When it last moved on; a recompute that has not moved for a minute was cut short. */
  movedAt: string | null;
  isStalled: boolean;
}

/** A recompute that has not moved on for this long is taken to have been cut short (a chunk takes well under a second). */
const STALLED_AFTER_MS = 60_000;

function recomputeStatusOf(s: { factsPendingSince: Date | null; factsRecomputeDone: number | null; factsRecomputeTotal: number | null; factsRecomputeAt: Date | null }, now = Date.now()): RecomputeStatus {
  const movedAt = s.factsRecomputeAt ?? s.factsPendingSince;
  return {
    pendingSince: s.factsPendingSince?.toISOString() ?? null,
    done: s.factsRecomputeDone ?? 0,
    total: s.factsRecomputeTotal ?? 0,
    movedAt: s.factsRecomputeAt?.toISOString() ?? null,
    isStalled: Boolean(s.factsPendingSince && movedAt && now - movedAt.getTime() > STALLED_AFTER_MS),
  };
}

export async function listRuleSetEditions(programId: number): Promise<RuleSetEditionOption[]> {
  const locals = await getDb().select().from(localRuleSets).where(eq(localRuleSets.programId, programId)).orderBy(asc(localRuleSets.createdAt));
  return [
    ...publishedRuleSets.map((r) => ({ edition: r.edition, label: r.label, isPublished: true, basedOn: null, adoptedOn: null, variances: [] })),
    ...locals.map((l) => {
      const data = l.data as RuleSet;
      return { edition: l.edition, label: l.label, isPublished: false, basedOn: data.basedOn, adoptedOn: l.adoptedOn, variances: data.variances ?? [] };
    }),
  ];
}

export async function getSettingsView(actor: Actor): Promise<SettingsView> {
  assertCan(actor, "settings.manage");
  const context = await getStaffProgramContext(actor);
  const s = context.settings;
  return {
    programName: context.name,
    settings: {
      testIntervalMonths: s.testIntervalMonths,
      dueModel: s.dueModel,
      windowStart: s.windowStart,
      windowEnd: s.windowEnd,
      dueSoonDays: s.dueSoonDays,
      repairDaysSevere: s.repairDaysSevere,
      repairDaysHigh: s.repairDaysHigh,
      repairDaysLow: s.repairDaysLow,
      reportDeadlineDays: s.reportDeadlineDays,
      reminderDaysBefore: s.reminderDaysBefore,
      overdueDaysAfter: s.overdueDaysAfter,
      finalDaysAfter: s.finalDaysAfter,
      repairReminderDaysBefore: s.repairReminderDaysBefore,
      discontinueDaysAfterFinal: s.discontinueDaysAfterFinal,
      filingFeeCents: s.filingFeeCents,
      currency: s.currency,
      units: s.units,
      ruleSetEdition: s.ruleSetEdition,
      kitPolicy: s.kitPolicy,
    },
    editions: await listRuleSetEditions(context.id),
    updatedAt: s.updatedAt.toISOString(),
    factsPendingSince: s.factsPendingSince?.toISOString() ?? null,
    recompute: recomputeStatusOf(s),
  };
}

/** The recompute's progress, for the settings page to follow. */
export async function getRecomputeStatus(actor: Actor): Promise<RecomputeStatus> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({ factsPendingSince: programSettings.factsPendingSince, factsRecomputeDone: programSettings.factsRecomputeDone, factsRecomputeTotal: programSettings.factsRecomputeTotal, factsRecomputeAt: programSettings.factsRecomputeAt })
    .from(programSettings)
    .where(eq(programSettings.programId, programId))
    .limit(1);
  if (!row) throw new NotFoundError("No settings for this program.");
  return recomputeStatusOf(row);
}

export interface SettingsUpdateResult {
  changed: string[];
  /** Due dates are to be recomputed (this change moves them, or an earlier recompute was cut short): see recomputeOwedFacts. */
  isRecomputeOwed: boolean;
}

/**
 * Saves the program's settings after lib/rules has judged them (due model, intervals, the notice
 * schedule's order). A change that moves due dates is marked as owing a recompute of every
 * assembly's stored facts, in the same transaction; the route hands recomputeOwedFacts to
 * after(), so the save answers at once and the settings page follows the progress.
 */
export async function updateProgramSettings(actor: Actor, input: SettingsInput): Promise<SettingsUpdateResult> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  const fieldErrors: Record<string, string[]> = {};
  for (const problem of validateProgramRules(programRulesFromSettings(input))) {
    const field = { testIntervalMonths: "testIntervalMonths", dueSoonDays: "dueSoonDays", reportDeadlineDays: "reportDeadlineDays", "repairDays.severe": "repairDaysSevere", "repairDays.high": "repairDaysHigh", "repairDays.low": "repairDaysLow", "dueModel.kind": "dueModel", "dueModel.startMonthDay": "windowStart", "dueModel.endMonthDay": "windowEnd" }[problem.path] ?? "_";
    (fieldErrors[field] ??= []).push(problem.message);
  }
  for (const problem of validateNoticeSchedule(noticeScheduleFromSettings(input))) (fieldErrors[problem.field || "_"] ??= []).push(problem.message);
  const db = getDb();
  const locals = await db.select({ edition: localRuleSets.edition }).from(localRuleSets).where(eq(localRuleSets.programId, programId));
  if (!ruleSetById(input.ruleSetEdition) && !locals.some((l) => l.edition === input.ruleSetEdition)) {
    (fieldErrors.ruleSetEdition ??= []).push("Choose a published edition or one of the program's local editions.");
  }
  if (Object.keys(fieldErrors).length > 0) {
    const first = Object.values(fieldErrors)[0]![0]!;
    throw new InputError(`Please check the highlighted settings. ${first}`, fieldErrors);
  }

  const changed = await db.transaction(async (tx) => {
    const [current] = await tx.select().from(programSettings).where(eq(programSettings.programId, programId)).for("update");
    if (!current) throw new NotFoundError("No settings for this program.");
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const key of Object.keys(input) as (keyof SettingsInput)[]) {
      if (current[key] !== input[key]) {
        before[key] = current[key];
        after[key] = input[key];
      }
    }
    const keys = Object.keys(after);
    if (keys.length === 0) return keys;
    const now = new Date();
    // A change that moves due dates is marked in the same transaction, so a recompute that is
    // cut short (the request or the process dying) is finished by the next one.
    const movesDueDates = keys.some((key) => (dueAffecting as readonly string[]).includes(key));
    await tx
      .update(programSettings)
      .set({ ...input, updatedAt: now, updatedBy: actor.id, ...(movesDueDates ? { factsPendingSince: now } : {}) })
      .where(eq(programSettings.programId, programId));
    await recordAudit(tx, { programId, actorId: actor.id, action: "settings.updated", entityType: "program_settings", entityId: programId, before, after });
    return keys;
  });
  const [mark] = await db.select({ since: programSettings.factsPendingSince }).from(programSettings).where(eq(programSettings.programId, programId)).limit(1);
  return { changed, isRecomputeOwed: Boolean(mark?.since) };
}

/**
 * The recompute owed after a settings change (or one cut short), to the end, a chunk per
 * transaction, each pass in the audit log. Runs after the save has answered.
 */
export async function recomputeOwedFacts(actor: Actor): Promise<void> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  await runPendingFactsRecompute(programId, async (recomputed) => {
    await recordAudit(getDb(), { programId, actorId: actor.id, action: "assemblies.facts_recomputed", entityType: "program", entityId: programId, after: recomputed });
  });
}

// ------------------------------------------------------------------ local rule-set editions

/** Which rules' sources a value path belongs to (a changed value needs its local source). */
const rulesOfPath: Record<RuleSetValuePath, RuleSetSourceKey[]> = {
  "rp.reliefMin": ["rp.relief.min"],
  "rp.check1Min": ["rp.check1.min"],
  "rp.check1MustExceedRelief": ["rp.check1.exceedsRelief"],
  "rp.bufferMin": ["rp.buffer.min"],
  "rp.check2FlowMin": ["rp.check2.flow.min"],
  "dc.check1Min": ["dc.check1.min"],
  "dc.check2Min": ["dc.check2.min"],
  "pvb.airInletMin": ["pvb.airInlet.min"],
  "pvb.checkMin": ["pvb.check.min"],
  "svb.airInletMin": ["svb.airInlet.min"],
  "svb.checkMin": ["svb.check.min"],
  "airGap.diameterFactor": ["ag.gap.min"],
  "airGap.minInches": ["ag.gap.min"],
  "airGap.sideWallFactor": ["ag.gap.sideWall.min"],
  "airGap.sideWallMinInches": ["ag.gap.sideWall.min"],
  "gauge.rangeMaxPsid": ["gauge.rangeMaxPsid"],
  "kit.verificationMaxMonths": ["kit.verificationMaxMonths"],
};

const valuePathSchema = z.enum(ruleSetValuePaths as [RuleSetValuePath, ...RuleSetValuePath[]]);

export const localRuleSetSchema = z.object({
  edition: z
    .string()
    .trim()
    .min(3, "Give the edition an id of at least 3 characters.")
    .max(60)
    .regex(/^[a-z0-9][a-z0-9-]*$/, "Use lower-case letters, digits and hyphens, e.g. quillmere-2027."),
  label: z.string().trim().min(3, "Describe the edition in a few words.").max(160),
  basedOn: z.string().trim().min(1),
  /** The local ordinance or decision the changed values come from. */
  localSource: z.string().trim().max(300).optional().default(""),
  adoptedOn: z.iso.date("Enter the adoption date as YYYY-MM-DD."),
  values: z.partialRecord(valuePathSchema, z.union([z.number().finite(), z.boolean(), z.null()])).default({}),
  variances: z.array(z.object({ path: valuePathSchema, reason: z.string().trim().max(500) })).max(20).default([]),
  adopt: z.boolean().optional().default(false),
});
export type LocalRuleSetInput = z.infer<typeof localRuleSetSchema>;

function setAtPath(target: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split(".");
  let current = target;
  for (const key of keys.slice(0, -1)) current = current[key] as Record<string, unknown>;
  current[keys.at(-1)!] = value;
}

/**
 * A program's own edition: a published edition with some values changed. lib/rules judges it
 * (shape, ranges, a source for every rule); a value less strict than the published one is
 * accepted only with the program's stated reason (a variance).
 */
export async function createLocalRuleSet(actor: Actor, input: LocalRuleSetInput): Promise<{ edition: string }> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  const base = ruleSetById(input.basedOn);
  if (!base) throw new InputError("Base the local edition on a published edition.", { basedOn: ["Choose a published edition."] });
  const candidate = structuredCloneRuleSet(base) as unknown as Record<string, unknown> & RuleSet;
  candidate.edition = input.edition;
  candidate.label = input.label;
  candidate.basedOn = base.edition;
  const changedPaths: RuleSetValuePath[] = [];
  for (const [path, value] of Object.entries(input.values) as [RuleSetValuePath, number | boolean | null][]) {
    if (valueAtPath(base, path) === value) continue;
    setAtPath(candidate, path, value);
    changedPaths.push(path);
  }
  if (changedPaths.length > 0 && !input.localSource) {
    throw new InputError("Name the local rule the changed values come from (e.g. the ordinance and section).", { localSource: ["Name the local rule the changed values come from."] });
  }
  for (const path of changedPaths) for (const rule of rulesOfPath[path]) candidate.sources[rule] = `${input.localSource} (local value; published: ${base.sources[rule]})`;
  candidate.variances = input.variances.filter((v) => changedPaths.includes(v.path) && v.reason);
  const problems = validateRuleSet(candidate, base);
  if (problems.length > 0) {
    const fieldErrors: Record<string, string[]> = {};
    for (const p of problems) (fieldErrors[p.path.startsWith("variances") ? "variances" : p.path || "_"] ??= []).push(p.message);
    throw new InputError(`The local edition was not saved. ${problems[0]!.message}`, fieldErrors);
  }
  const db = getDb();
  try {
    await db.transaction(async (tx) => {
      await tx.insert(localRuleSets).values({ programId, edition: input.edition, label: input.label, data: candidate, adoptedOn: input.adoptedOn, createdAt: new Date() });
      await recordAudit(tx, { programId, actorId: actor.id, action: "rule_set.created", entityType: "local_rule_set", entityId: input.edition, after: { basedOn: base.edition, changed: Object.fromEntries(changedPaths.map((p) => [p, valueAtPath(candidate, p)])), variances: candidate.variances } });
      if (input.adopt) {
        const [current] = await tx.select({ edition: programSettings.ruleSetEdition }).from(programSettings).where(eq(programSettings.programId, programId)).for("update");
        await tx.update(programSettings).set({ ruleSetEdition: input.edition, updatedAt: new Date(), updatedBy: actor.id }).where(eq(programSettings.programId, programId));
        await recordAudit(tx, { programId, actorId: actor.id, action: "settings.updated", entityType: "program_settings", entityId: programId, before: { ruleSetEdition: current?.edition }, after: { ruleSetEdition: input.edition } });
      }
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new InputError("The program already has an edition with this id.", { edition: ["This id is taken: choose another."] });
    throw error;
  }
  return { edition: input.edition };
}

// ------------------------------------------------------------------ return reasons

export interface ReturnReasonRow {
  id: number;
  label: string;
  guidance: string | null;
  isActive: boolean;
  sortOrder: number;
}

/** The reasons an inspector picks from when returning a report (active ones, in order, unless all are asked for). */
export async function listReturnReasons(actor: Actor, options: { includeInactive?: boolean } = {}): Promise<ReturnReasonRow[]> {
  assertCan(actor, options.includeInactive ? "settings.manage" : "reports.review");
  const programId = staffProgramId(actor);
  return getDb()
    .select({ id: returnReasons.id, label: returnReasons.label, guidance: returnReasons.guidance, isActive: returnReasons.isActive, sortOrder: returnReasons.sortOrder })
    .from(returnReasons)
    .where(and(eq(returnReasons.programId, programId), options.includeInactive ? undefined : eq(returnReasons.isActive, true)))
    .orderBy(asc(returnReasons.sortOrder), asc(returnReasons.id));
}

export const returnReasonSchema = z.object({
  label: z.string().trim().min(3, "Write the reason in a few words.").max(200, "At most 200 characters."),
  guidance: z.string().trim().max(1000, "At most 1,000 characters.").optional().default(""),
  isActive: z.boolean().optional().default(true),
});

async function assertLabelFree(programId: number, label: string, exceptId?: number): Promise<void> {
  const [clash] = await getDb()
    .select({ id: returnReasons.id })
    .from(returnReasons)
    .where(and(eq(returnReasons.programId, programId), eq(returnReasons.label, label), exceptId ? ne(returnReasons.id, exceptId) : undefined))
    .limit(1);
  if (clash) throw new InputError("The program already has this reason.", { label: ["This reason is already on the list."] });
}

export async function createReturnReason(actor: Actor, input: z.infer<typeof returnReasonSchema>): Promise<{ id: number }> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  await assertLabelFree(programId, input.label);
  return getDb().transaction(async (tx) => {
    const [last] = await tx.select({ n: max(returnReasons.sortOrder) }).from(returnReasons).where(eq(returnReasons.programId, programId));
    const [row] = await tx
      .insert(returnReasons)
      .values({ programId, label: input.label, guidance: input.guidance || null, isActive: input.isActive, sortOrder: (last?.n ?? -1) + 1 })
      .$returningId();
    await recordAudit(tx, { programId, actorId: actor.id, action: "return_reason.created", entityType: "return_reason", entityId: row!.id, after: input });
    return { id: row!.id };
  });
}

/**
 * Reasons are never deleted: a returned report keeps the words it was returned with, and a
 * retired reason is only taken off the inspector's list.
 */
export async function updateReturnReason(actor: Actor, id: number, input: z.infer<typeof returnReasonSchema> & { move?: "up" | "down" }): Promise<void> {
  assertCan(actor, "settings.manage");
  const programId = staffProgramId(actor);
  await assertLabelFree(programId, input.label, id);
  await getDb().transaction(async (tx) => {
    const all = await tx.select().from(returnReasons).where(eq(returnReasons.programId, programId)).orderBy(asc(returnReasons.sortOrder), asc(returnReasons.id)).for("update");
    const index = all.findIndex((r) => r.id === id);
    const current = all[index];
    if (!current) throw new NotFoundError("No such return reason in your program.");
    await tx.update(returnReasons).set({ label: input.label, guidance: input.guidance || null, isActive: input.isActive }).where(eq(returnReasons.id, id));
    if (input.move) {
      const order = [...all];
      const target = input.move === "up" ? index - 1 : index + 1;
      if (target >= 0 && target < order.length) {
        [order[index], order[target]] = [order[target]!, order[index]!];
        for (const [position, reason] of order.entries()) if (reason.sortOrder !== position) await tx.update(returnReasons).set({ sortOrder: position }).where(eq(returnReasons.id, reason.id));
      }
    }
    await recordAudit(tx, {
      programId,
      actorId: actor.id,
      action: "return_reason.updated",
      entityType: "return_reason",
      entityId: id,
      before: { label: current.label, guidance: current.guidance, isActive: current.isActive },
      after: { label: input.label, guidance: input.guidance || null, isActive: input.isActive, ...(input.move ? { moved: input.move } : {}) },
    });
  });
}
