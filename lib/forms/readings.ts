// The field-test form's readings: which fields each assembly kind records, how a typed value
// becomes a reading, and the live grade beside each field. Pure: the browser runs it as the
// tester types and the server runs the same lib/rules grading on submission.
import {
  familyOf,
  fieldLabels,
  formatMinimum,
  gradeFieldTest,
  kpaToPsid,
  optionalFields,
  psidToKpa,
  ReadingValidationError,
  requiredFields,
  type AssemblyKind,
  type FieldTestField,
  type FieldTestInput,
  type Finding,
  type Grade,
  type ReadingUnit,
  type RuleSet,
} from "@/lib/rules";

export type ReadingFieldType = "differential" | "inches" | "flag";

export interface ReadingFieldSpec {
  field: FieldTestField;
  label: string;
  type: ReadingFieldType;
  isRequired: boolean;
  /** The valve may not open at all (recorded as "did not open", which fails). */
  canFailToOpen: boolean;
  /** How the reading is taken, in a few words. */
  hint: string;
  /** Words on the two buttons of a yes/no field, the passing answer first. */
  answers?: { yes: string; no: string };
}

const hints: Partial<Record<FieldTestField, string>> = {
  reliefValveOpeningPoint: "Zone slowly filled until the relief valve first drips.",
  check1Differential: "High side on #2, low side on #3, No. 2 shutoff closed.",
  check1ClosedTight: "The gauge held steady across check #1.",
  check2ClosedTight: "Backpressure applied at #4: the gauge held and the relief valve stayed shut.",
  check2Differential: "Across check #2, #3 to #4.",
  shutoff2Tight: "If it leaks, no-flow was not reached and the readings are not valid.",
  airInletOpeningPoint: "Body drained until the air inlet poppet opens.",
  airInletFullyOpen: "The poppet opened all the way.",
  checkDifferential: "Across the check valve.",
  checkClosedTight: "The gauge held steady across the check.",
  supplyPipeDiameterInches: "Inside diameter of the supply pipe, inches.",
  airGapInches: "From the outlet down to the flood-level rim, inches.",
  nearSideWall: "A wall or obstruction close to the opening needs a larger gap.",
};

const answers: Partial<Record<FieldTestField, { yes: string; no: string }>> = {
  check1ClosedTight: { yes: "Closed tight", no: "Leaked" },
  check2ClosedTight: { yes: "Held tight", no: "Leaked" },
  shutoff2Tight: { yes: "Tight", no: "Leaks" },
  airInletFullyOpen: { yes: "Opened fully", no: "Only partly" },
  checkClosedTight: { yes: "Closed tight", no: "Leaked" },
  nearSideWall: { yes: "Wall near", no: "No wall near" },
};

const fieldOrder: Record<ReturnType<typeof familyOf>, FieldTestField[]> = {
  rp: ["reliefValveOpeningPoint", "check1Differential", "check1ClosedTight", "check2ClosedTight", "check2Differential", "shutoff2Tight"],
  dc: ["check1Differential", "check1ClosedTight", "check2Differential", "check2ClosedTight", "shutoff2Tight"],
  vb: ["airInletOpeningPoint", "airInletFullyOpen", "checkDifferential", "checkClosedTight"],
  ag: ["supplyPipeDiameterInches", "airGapInches", "nearSideWall"],
};

const differentialFieldSet = new Set<FieldTestField>(["reliefValveOpeningPoint", "check1Differential", "check2Differential", "airInletOpeningPoint", "checkDifferential"]);
const inchFieldSet = new Set<FieldTestField>(["supplyPipeDiameterInches", "airGapInches"]);
const canFailToOpenSet = new Set<FieldTestField>(["reliefValveOpeningPoint", "airInletOpeningPoint"]);

/** The fields the form shows for a kind, in the order the procedure takes them. */
export function readingFieldsFor(kind: AssemblyKind, ruleSet: RuleSet): ReadingFieldSpec[] {
  const required = new Set(requiredFields(kind, ruleSet));
  const optional = new Set(optionalFields(kind, ruleSet));
  return fieldOrder[familyOf(kind)]
    .filter((field) => required.has(field) || optional.has(field))
    .map((field) => ({
      field,
      label: fieldLabels[field],
      type: differentialFieldSet.has(field) ? "differential" : inchFieldSet.has(field) ? "inches" : "flag",
      isRequired: required.has(field),
      canFailToOpen: canFailToOpenSet.has(field),
      hint: hints[field] ?? "",
      ...(answers[field] ? { answers: answers[field] } : {}),
    }));
}

/** One phase of the test (the initial test or the retest) as the tester typed it. */
export interface PhaseDraft {
  /** Numbers exactly as typed, so "2." or "" survive a reload. */
  text: Partial<Record<FieldTestField, string>>;
  flags: Partial<Record<FieldTestField, boolean>>;
  /** The relief valve or the air inlet did not open. */
  didNotOpen: Partial<Record<FieldTestField, boolean>>;
}

export function emptyPhase(): PhaseDraft {
  return { text: {}, flags: {}, didNotOpen: {} };
}

export type ParsedReading = { state: "empty" } | { state: "ok"; value: number } | { state: "error"; message: string };

/** Highest differential the gauge can show, in the unit readings are typed in (rounded down, so it is never above the range). */
export function gaugeRangeIn(unit: ReadingUnit, ruleSet: RuleSet): number {
  const max = ruleSet.gauge.rangeMaxPsid;
  return unit === "kPa" ? Math.floor(psidToKpa(max) * 10 + 1e-9) / 10 : max;
}

/** The biggest inch value a measurement may hold (the column keeps two decimals). */
export const MAX_INCHES = 1000;

/**
 * A typed value → a reading, or a message the tester can act on. Accepts a decimal comma
 * (phones in some locales offer only ","). Differentials: one decimal place, within the gauge's
 * range (a 0–15 psid differential gauge: test-equipment trade article [S]). Inches: two decimals.
 */
export function parseReadingText(text: string | undefined, type: Exclude<ReadingFieldType, "flag">, unit: ReadingUnit, ruleSet: RuleSet): ParsedReading {
  const raw = (text ?? "").trim().replace(",", ".");
  if (raw === "") return { state: "empty" };
  if (/^-/.test(raw)) return { state: "error", message: type === "differential" ? "A differential gauge reads from 0: a reading cannot be negative." : "A measurement cannot be negative." };
  if (/[a-z]/i.test(raw)) return { state: "error", message: "Numbers only: letters are not a reading (for example 2.4)." };
  if (!/^(\d+(\.\d*)?|\.\d+)$/.test(raw)) return { state: "error", message: "Enter a number, for example 2.4." };
  const decimals = raw.includes(".") ? raw.length - raw.indexOf(".") - 1 : 0;
  const value = Number(raw);
  if (type === "differential") {
    if (decimals > 1) return { state: "error", message: `One decimal place, as the gauge is read (for example ${value.toFixed(1)}).` };
    const psid = unit === "kPa" ? kpaToPsid(value) : value;
    // The same float-noise allowance lib/rules uses, so the form and the server agree at the edge.
    if (psid > ruleSet.gauge.rangeMaxPsid + 1e-9) {
      return { state: "error", message: `Above the gauge's range of ${formatMinimum(gaugeRangeIn(unit, ruleSet))} ${unit}: re-read the gauge.` };
    }
    return { state: "ok", value };
  }
  if (decimals > 2) return { state: "error", message: "Two decimal places at most (for example 1.25)." };
  if (value > MAX_INCHES) return { state: "error", message: `More than ${MAX_INCHES} inches: check the measurement.` };
  return { state: "ok", value };
}

export interface PhaseInput {
  input: FieldTestInput;
  /** Field → the message to show beside it; those fields are left out of the input. */
  errors: Partial<Record<FieldTestField, string>>;
}

/** The typed phase → the lib/rules input, leaving out (and reporting) what cannot be a reading. */
export function phaseToInput(kind: AssemblyKind, unit: ReadingUnit, phase: PhaseDraft, ruleSet: RuleSet): PhaseInput {
  const input: FieldTestInput = { kind, unit: familyOf(kind) === "ag" ? "psid" : unit };
  const errors: PhaseInput["errors"] = {};
  const target = input as unknown as Record<string, unknown>;
  for (const spec of readingFieldsFor(kind, ruleSet)) {
    if (spec.type === "flag") {
      const flag = phase.flags[spec.field];
      if (typeof flag === "boolean") target[spec.field] = flag;
      continue;
    }
    if (spec.canFailToOpen && phase.didNotOpen[spec.field]) {
      target[spec.field] = null;
      continue;
    }
    const parsed = parseReadingText(phase.text[spec.field], spec.type, unit, ruleSet);
    if (parsed.state === "ok") target[spec.field] = parsed.value;
    else if (parsed.state === "error") errors[spec.field] = parsed.message;
  }
  if (typeof input.supplyPipeDiameterInches === "number" && input.supplyPipeDiameterInches === 0) {
    delete input.supplyPipeDiameterInches;
    errors.supplyPipeDiameterInches = "The supply pipe's diameter must be more than 0 inches.";
  }
  return { input, errors };
}

/** The field each grading rule speaks about, so its finding shows beside that input. */
export const fieldOfRule: Readonly<Record<string, FieldTestField>> = Object.freeze({
  "rp.relief.min": "reliefValveOpeningPoint",
  "rp.check1.min": "check1Differential",
  "rp.check1.tight": "check1ClosedTight",
  "rp.check1.exceedsRelief": "check1Differential",
  "rp.buffer.min": "check1Differential",
  "rp.check2.tight": "check2ClosedTight",
  "rp.check2.flow.min": "check2Differential",
  "rp.shutoff2.tight": "shutoff2Tight",
  "dc.check1.min": "check1Differential",
  "dc.check1.tight": "check1ClosedTight",
  "dc.check2.min": "check2Differential",
  "dc.check2.tight": "check2ClosedTight",
  "dc.shutoff2.tight": "shutoff2Tight",
  "pvb.airInlet.min": "airInletOpeningPoint",
  "pvb.airInlet.fullyOpen": "airInletFullyOpen",
  "pvb.check.min": "checkDifferential",
  "pvb.check.tight": "checkClosedTight",
  "svb.airInlet.min": "airInletOpeningPoint",
  "svb.airInlet.fullyOpen": "airInletFullyOpen",
  "svb.check.min": "checkDifferential",
  "svb.check.tight": "checkClosedTight",
  "ag.gap.min": "airGapInches",
  "ag.gap.sideWall.min": "airGapInches",
});

export interface PhaseGrade {
  /** lib/rules' grade of what could be read; null only if lib/rules refused the input. */
  grade: Grade | null;
  outcome: Grade["outcome"];
  findingsByField: Partial<Record<FieldTestField, Finding[]>>;
  errors: Partial<Record<FieldTestField, string>>;
  /** Required fields not yet given (or given wrongly), in form order. */
  missing: FieldTestField[];
}

/** Grades a typed phase with lib/rules, field by field, as the tester types. */
export function gradePhase(kind: AssemblyKind, unit: ReadingUnit, phase: PhaseDraft, ruleSet: RuleSet): PhaseGrade {
  const { input, errors } = phaseToInput(kind, unit, phase, ruleSet);
  let grade: Grade | null = null;
  try {
    grade = gradeFieldTest(input, ruleSet);
  } catch (error) {
    if (!(error instanceof ReadingValidationError)) throw error;
    errors[error.field as FieldTestField] ??= error.message;
  }
  const findingsByField: PhaseGrade["findingsByField"] = {};
  for (const finding of grade?.findings ?? []) {
    const field = fieldOfRule[finding.rule];
    if (field) (findingsByField[field] ??= []).push(finding);
  }
  const missingSet = new Set<string>(grade?.missing ?? []);
  for (const field of Object.keys(errors)) missingSet.add(field);
  const missing = readingFieldsFor(kind, ruleSet)
    .map((spec) => spec.field)
    .filter((field) => missingSet.has(field));
  const hasErrors = Object.keys(errors).length > 0;
  const outcome: Grade["outcome"] = grade?.outcome === "fail" ? "fail" : hasErrors || !grade ? "incomplete" : grade.outcome;
  return { grade, outcome, findingsByField, errors, missing };
}

export interface MinimumText {
  rule: string;
  required: string;
  source: string;
}

/**
 * The minimum each field will be held to, before anything is typed: lib/rules grades a probe
 * (zero readings, everything tight) and its findings carry the required texts and sources, so
 * the form never restates a minimum of its own.
 */
export function minimumsFor(kind: AssemblyKind, unit: ReadingUnit, ruleSet: RuleSet, options: { pipeDiameterInches?: number; isNearSideWall?: boolean } = {}): Partial<Record<FieldTestField, MinimumText[]>> {
  const family = familyOf(kind);
  const probe: FieldTestInput =
    family === "rp"
      ? { kind, unit, reliefValveOpeningPoint: 0, check1Differential: 0, check1ClosedTight: true, check2ClosedTight: true, check2Differential: 0, shutoff2Tight: true }
      : family === "dc"
        ? { kind, unit, check1Differential: 0, check1ClosedTight: true, check2Differential: 0, check2ClosedTight: true, shutoff2Tight: true }
        : family === "vb"
          ? { kind, unit, airInletOpeningPoint: 0, airInletFullyOpen: true, checkDifferential: 0, checkClosedTight: true }
          : { kind, supplyPipeDiameterInches: options.pipeDiameterInches && options.pipeDiameterInches > 0 ? options.pipeDiameterInches : 1, airGapInches: 0, nearSideWall: options.isNearSideWall ?? false };
  const out: Partial<Record<FieldTestField, MinimumText[]>> = {};
  for (const finding of gradeFieldTest(probe, ruleSet).findings) {
    const field = fieldOfRule[finding.rule];
    if (field) (out[field] ??= []).push({ rule: finding.rule, required: finding.required ?? "", source: finding.source });
  }
  return out;
}

/** The phase as it was recorded, back into typed form (to correct a returned report). */
export function phaseFromInput(input: FieldTestInput | null | undefined): PhaseDraft {
  const phase = emptyPhase();
  if (!input) return phase;
  for (const [key, value] of Object.entries(input)) {
    if (key === "kind" || key === "unit") continue;
    const field = key as FieldTestField;
    if (value === null) phase.didNotOpen[field] = true;
    else if (typeof value === "boolean") phase.flags[field] = value;
    else if (typeof value === "number") phase.text[field] = inchFieldSet.has(field) ? String(value) : value.toFixed(1);
  }
  return phase;
}
