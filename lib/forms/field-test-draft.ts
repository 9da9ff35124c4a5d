// A field-test report while the tester fills it in: the draft as saved on the phone and on the
// server, what it still lacks, the live grade of each phase, and the submission body it becomes.
// Pure: no clock (today is an argument), no storage, no network.
import { addMonths, checkReportValidity, familyOf, isIsoDate, kpaToPsid, type AssemblyKind, type FieldTestInput, type KitPolicy, type ReadingUnit, type RuleSet } from "@/lib/rules";
import { emptyPhase, gradePhase, phaseToInput, readingFieldsFor, type PhaseDraft, type PhaseGrade } from "./readings";
import { findRepairProblems, repairRowsFromDraft, repairComponents, repairParts, repairActions, type ComponentRepairDraft } from "./repairs";
import { installationKinds, testReasons, type TestReason } from "./report-options";
import type { ReportSubmissionInput, SubmittedReadings } from "./report-submission";

export interface FieldTestDraft {
  v: 1;
  assemblyId: number;
  kind: AssemblyKind;
  unit: ReadingUnit;
  correctsReportId: number | null;
  amendsReportId: number | null;
  kitId: number | null;
  testedOn: string;
  testedTime: string;
  reason: TestReason | "";
  reasonNote: string;
  installation: (typeof installationKinds)[number];
  previousSerial: string;
  orientationApproved: boolean | null;
  reliefPortAirGapOk: boolean | null;
  linePressure: string;
  initial: PhaseDraft;
  /** Asked only when the initial test fails. */
  repairChoice: "repaired" | "not_repaired" | null;
  repairs: ComponentRepairDraft[];
  retest: PhaseDraft;
  remarks: string;
  attestationName: string;
  attestationConfirmed: boolean;
}

export function newDraft(args: {
  assemblyId: number;
  kind: AssemblyKind;
  unit: ReadingUnit;
  testedOn: string;
  testedTime: string;
  kitId?: number | null;
  reason?: TestReason | "";
  correctsReportId?: number | null;
  amendsReportId?: number | null;
}): FieldTestDraft {
  return {
    v: 1,
    assemblyId: args.assemblyId,
    kind: args.kind,
    unit: familyOf(args.kind) === "ag" ? "psid" : args.unit,
    correctsReportId: args.correctsReportId ?? null,
    amendsReportId: args.amendsReportId ?? null,
    kitId: args.kitId ?? null,
    testedOn: args.testedOn,
    testedTime: args.testedTime,
    reason: args.reason ?? "",
    reasonNote: "",
    installation: args.reason === "installation" ? "new" : "existing",
    previousSerial: "",
    orientationApproved: null,
    reliefPortAirGapOk: null,
    linePressure: "",
    initial: emptyPhase(),
    repairChoice: null,
    repairs: [],
    retest: emptyPhase(),
    remarks: "",
    attestationName: "",
    attestationConfirmed: false,
  };
}

/**
 * A draft read back from the phone's storage, or null when it is not one (an older format,
 * tampering). A hand-written structural check with the same limits as the server's zod schema
 * (lib/forms/field-test-draft-schema.ts; a unit test holds the two to the same verdicts), so
 * the form never ships a validation library to the browser.
 */
export function parseDraft(value: unknown): FieldTestDraft | null {
  return isFieldTestDraft(value) ? value : null;
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
const isText = (v: unknown, max: number): v is string => typeof v === "string" && v.length <= max;
const isId = (v: unknown): v is number => typeof v === "number" && Number.isSafeInteger(v) && v > 0;
const isOneOf = <T extends string>(v: unknown, options: readonly T[]): v is T => typeof v === "string" && (options as readonly string[]).includes(v);
const isNullable = (v: unknown, check: (x: unknown) => boolean) => v === null || check(v);
const isBooleanOrNull = (v: unknown) => v === null || typeof v === "boolean";
const isFieldMap = (v: unknown, check: (x: unknown) => boolean) => isRecord(v) && Object.entries(v).every(([k, x]) => k.length <= 40 && check(x));
const isPhase = (v: unknown) =>
  isRecord(v) && isFieldMap(v.text, (x) => isText(x, 20)) && isFieldMap(v.flags, (x) => typeof x === "boolean") && isFieldMap(v.didNotOpen, (x) => typeof x === "boolean");
const isRepair = (v: unknown) =>
  isRecord(v) &&
  isOneOf(v.component, repairComponents) &&
  isRecord(v.parts) &&
  Object.entries(v.parts).every(([part, action]) => isOneOf(part, repairParts) && isOneOf(action, repairActions)) &&
  isText(v.note, 300);

function isFieldTestDraft(v: unknown): v is FieldTestDraft {
  return (
    isRecord(v) &&
    v.v === 1 &&
    isId(v.assemblyId) &&
    isOneOf(v.kind, ["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"] as const) &&
    isOneOf(v.unit, ["psid", "kPa"] as const) &&
    isNullable(v.correctsReportId, isId) &&
    isNullable(v.amendsReportId, isId) &&
    isNullable(v.kitId, isId) &&
    isText(v.testedOn, 10) &&
    isText(v.testedTime, 5) &&
    isOneOf(v.reason, [...testReasons, ""] as const) &&
    isText(v.reasonNote, 300) &&
    isOneOf(v.installation, installationKinds) &&
    isText(v.previousSerial, 60) &&
    isBooleanOrNull(v.orientationApproved) &&
    isBooleanOrNull(v.reliefPortAirGapOk) &&
    isText(v.linePressure, 20) &&
    isPhase(v.initial) &&
    isNullable(v.repairChoice, (x) => isOneOf(x, ["repaired", "not_repaired"] as const)) &&
    Array.isArray(v.repairs) &&
    v.repairs.length <= 12 &&
    v.repairs.every(isRepair) &&
    isPhase(v.retest) &&
    isText(v.remarks, 2000) &&
    isText(v.attestationName, 120) &&
    typeof v.attestationConfirmed === "boolean"
  );
}

/** Everything outside the draft that decides whether it can be filed. */
export interface DraftContext {
  ruleSet: RuleSet;
  /** The program's today (its time zone). */
  today: string;
  kitPolicy: KitPolicy;
  installedOn: string | null;
  removedOn: string | null;
  testerName: string;
  certification: { expiresOn: string; issuedOn: string | null } | null;
  kits: readonly { id: number; lastVerifiedOn: string; verificationResult: "passed" | "adjusted" | "failed" }[];
}

export interface CredentialStatus {
  /** Reasons the report cannot be filed with this certification and kit on this test date. */
  blocking: { field: "certification" | "kitId"; message: string }[];
  /** Reasons the inspector will look twice (e.g. a kit checked long ago under a "flag" policy). */
  warnings: { field: "certification" | "kitId"; message: string }[];
  /** The kit's accuracy check covers tests up to this day. */
  kitValidUntil: string | null;
}

/**
 * The certification and kit judged on the test date by lib/rules' validity check (the same
 * call the server makes), so the form can say "you cannot submit" before any reading is typed.
 */
export function checkCredentials(args: { testedOn: string; today: string; kitId: number | null; context: DraftContext }): CredentialStatus {
  const { context } = args;
  const testDate = isIsoDate(args.testedOn) ? args.testedOn : args.today;
  const kit = context.kits.find((k) => k.id === args.kitId) ?? null;
  const issues = checkReportValidity({
    testDate,
    today: args.today,
    certificationExpiresOn: context.certification?.expiresOn ?? null,
    certificationIssuedOn: context.certification?.issuedOn ?? null,
    kitVerifiedOn: kit?.lastVerifiedOn ?? null,
    input: { kind: "DC" },
    linePressurePsi: 60,
    ruleSet: context.ruleSet,
    kitPolicy: context.kitPolicy,
  });
  const status: CredentialStatus = { blocking: [], warnings: [], kitValidUntil: kit ? addMonths(kit.lastVerifiedOn, context.ruleSet.kit.verificationMaxMonths) : null };
  for (const issue of issues) {
    const field = issue.code.startsWith("certification_") ? "certification" : issue.code.startsWith("kit_") ? "kitId" : null;
    if (!field) continue;
    if (field === "kitId" && args.kitId === null) continue;
    (issue.severity === "error" ? status.blocking : status.warnings).push({ field, message: issue.message });
  }
  // A gauge that failed its accuracy check is out of service until it passes one.
  if (kit?.verificationResult === "failed") status.blocking.push({ field: "kitId", message: "This kit failed its last accuracy check: it cannot be used until it passes one." });
  return status;
}

/** "Dana  whitlock-ray" matches "Dana Whitlock-Ray": case and spacing do not count. */
export function isSameName(typed: string, accountName: string): boolean {
  const normalise = (value: string) => value.normalize("NFKC").trim().replace(/\s+/g, " ").toLocaleLowerCase("en");
  return normalise(typed) !== "" && normalise(typed) === normalise(accountName);
}

/** Line pressure as typed → psi for the record, or a message. */
export function parseLinePressure(text: string, unit: ReadingUnit): { state: "empty" } | { state: "ok"; value: number; psi: number } | { state: "error"; message: string } {
  const raw = text.trim().replace(",", ".");
  if (raw === "") return { state: "empty" };
  if (!/^(\d+(\.\d*)?|\.\d+)$/.test(raw)) return { state: "error", message: /[a-z]/i.test(raw) ? "Numbers only: letters are not a pressure." : "Enter the line pressure as a number, for example 65." };
  const value = Number(raw);
  if (value <= 0) return { state: "error", message: "The line pressure must be more than 0." };
  const psi = unit === "kPa" ? kpaToPsid(value) : value;
  if (psi > 290) return { state: "error", message: `That is more than ${unit === "kPa" ? "2000 kPa" : "290 psi"}: check the line pressure.` };
  return { state: "ok", value: Math.round(value * 10) / 10, psi: Math.round(psi * 10) / 10 };
}

export interface DraftEvaluation {
  initial: PhaseGrade;
  retest: PhaseGrade | null;
  /** The initial test failed: the repair question (and, if repaired, the retest) is asked. */
  needsRepairChoice: boolean;
  isRetestShown: boolean;
  /** What the report will say if submitted now. */
  finalOutcome: "pass" | "fail" | "incomplete";
  credentials: CredentialStatus;
  /** Form path → message ("initial.check1Differential", "testedOn", "repairs.check1", …). */
  errors: Record<string, string>;
  canSubmit: boolean;
}

const requiredMessage = (type: "flag" | "differential" | "inches") => (type === "flag" ? "Choose one." : "Enter the reading.");

function phaseErrors(prefix: string, kind: AssemblyKind, ruleSet: RuleSet, grade: PhaseGrade, phase: PhaseDraft, errors: Record<string, string>): void {
  for (const spec of readingFieldsFor(kind, ruleSet)) {
    const parseError = grade.errors[spec.field];
    if (parseError) errors[`${prefix}.${spec.field}`] = parseError;
    else if (spec.isRequired && grade.missing.includes(spec.field)) {
      // PVB/SVB: whether the inlet opened fully is not asked when it did not open at all.
      if (spec.field === "airInletFullyOpen" && phase.didNotOpen.airInletOpeningPoint) continue;
      errors[`${prefix}.${spec.field}`] = spec.canFailToOpen ? 'Enter the opening point, or mark "did not open".' : requiredMessage(spec.type);
    }
  }
}

/** The draft judged as it stands: live grades, credentials, and every message the form can show. */
export function evaluateDraft(draft: FieldTestDraft, context: DraftContext): DraftEvaluation {
  const errors: Record<string, string> = {};
  const { ruleSet } = context;
  const initial = gradePhase(draft.kind, draft.unit, draft.initial, ruleSet);
  phaseErrors("initial", draft.kind, ruleSet, initial, draft.initial, errors);
  const needsRepairChoice = initial.outcome === "fail";
  const isRetestShown = needsRepairChoice && draft.repairChoice === "repaired";
  let retest: PhaseGrade | null = null;
  if (isRetestShown) {
    retest = gradePhase(draft.kind, draft.unit, draft.retest, ruleSet);
    phaseErrors("retest", draft.kind, ruleSet, retest, draft.retest, errors);
    const problems = findRepairProblems(draft.kind, draft.repairs);
    for (const [component, message] of Object.entries(problems)) errors[component ? `repairs.${component}` : "repairs"] = message;
  }
  if (needsRepairChoice && draft.repairChoice === null) errors.repairChoice = "Say whether the assembly was repaired on the spot.";

  if (!isIsoDate(draft.testedOn)) errors.testedOn = "Enter the date of the test.";
  else if (draft.testedOn > context.today) errors.testedOn = `The test date cannot be after today (${context.today}).`;
  else if (context.installedOn && draft.testedOn < context.installedOn) errors.testedOn = `The test date is before the assembly was installed (${context.installedOn}).`;
  else if (context.removedOn && draft.testedOn > context.removedOn) errors.testedOn = `The test date is after the assembly was removed (${context.removedOn}).`;
  if (!/^([01]\d|2[0-3]):[0-5]\d$/.test(draft.testedTime)) errors.testedTime = "Enter the time of the test.";
  if (draft.reason === "") errors.reason = "Say why the assembly was tested.";
  else if (draft.reason === "other" && draft.reasonNote.trim() === "") errors.reasonNote = "Say what the reason was.";
  if (draft.installation === "replacement" && draft.previousSerial.trim() === "") errors.previousSerial = "Give the serial of the assembly this one replaces.";

  if (familyOf(draft.kind) !== "ag") {
    const pressure = parseLinePressure(draft.linePressure, draft.unit);
    if (pressure.state === "empty") errors.linePressure = "Enter the line pressure.";
    else if (pressure.state === "error") errors.linePressure = pressure.message;
  }

  if (draft.kitId === null) errors.kitId = "Pick the test kit you used.";
  else if (!context.kits.some((kit) => kit.id === draft.kitId)) errors.kitId = "That kit is no longer in your list: pick another.";
  const credentials = checkCredentials({ testedOn: draft.testedOn, today: context.today, kitId: draft.kitId, context });
  for (const problem of credentials.blocking) errors[problem.field] ??= problem.message;

  if (!isSameName(draft.attestationName, context.testerName)) {
    errors.attestationName = draft.attestationName.trim() === "" ? "Type your name to sign the report." : `Type your name as it is on your account: ${context.testerName}.`;
  }
  if (!draft.attestationConfirmed) errors.attestationConfirmed = "Confirm that the readings are true and were taken by you.";

  const finalOutcome = initial.outcome === "incomplete" ? "incomplete" : isRetestShown ? (retest?.outcome ?? "incomplete") : initial.outcome;
  return { initial, retest, needsRepairChoice, isRetestShown, finalOutcome, credentials, errors, canSubmit: Object.keys(errors).length === 0 };
}

/** lib/rules input → the API's readings (a valve that did not open is the word, not null). */
export function readingsForSubmission(input: FieldTestInput): SubmittedReadings {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(input)) {
    if (key === "kind" || key === "unit" || value === undefined) continue;
    out[key] = value === null ? "did_not_open" : value;
  }
  return out;
}

/** The API's readings → lib/rules input. */
export function inputFromSubmission(kind: AssemblyKind, unit: ReadingUnit, readings: SubmittedReadings): FieldTestInput {
  const input: FieldTestInput = { kind, unit: familyOf(kind) === "ag" ? "psid" : unit };
  for (const [key, value] of Object.entries(readings)) {
    if (value === undefined) continue;
    (input as unknown as Record<string, unknown>)[key] = value === "did_not_open" ? null : value;
  }
  return input;
}

/** The draft → the body of POST /api/reports. Call when evaluateDraft says canSubmit. */
export function buildSubmission(draft: FieldTestDraft, context: DraftContext, keys: { idempotencyKey: string; draftKey?: string }): ReportSubmissionInput {
  const evaluation = evaluateDraft(draft, context);
  const initial = phaseToInput(draft.kind, draft.unit, draft.initial, context.ruleSet).input;
  const retest = evaluation.isRetestShown ? phaseToInput(draft.kind, draft.unit, draft.retest, context.ruleSet).input : null;
  const pressure = parseLinePressure(draft.linePressure, draft.unit);
  const isReliefPortAsked = familyOf(draft.kind) === "rp";
  return {
    idempotencyKey: keys.idempotencyKey,
    ...(keys.draftKey ? { draftKey: keys.draftKey } : {}),
    assemblyId: draft.assemblyId,
    kitId: draft.kitId ?? 0,
    testedOn: draft.testedOn,
    testedTime: draft.testedTime,
    reason: draft.reason === "" ? "annual" : draft.reason,
    reasonNote: draft.reason === "other" ? draft.reasonNote.trim() : "",
    installation: draft.installation,
    previousSerial: draft.installation === "replacement" ? draft.previousSerial.trim() : "",
    orientationApproved: draft.orientationApproved,
    reliefPortAirGapOk: isReliefPortAsked ? draft.reliefPortAirGapOk : null,
    unit: draft.unit,
    linePressure: pressure.state === "ok" ? pressure.value : null,
    initial: readingsForSubmission(initial),
    repairs: retest ? repairRowsFromDraft(draft.repairs) : [],
    retest: retest ? readingsForSubmission(retest) : null,
    remarks: draft.remarks.trim(),
    attestation: { name: draft.attestationName.trim(), confirmed: true },
    correctsReportId: draft.correctsReportId,
    amendsReportId: draft.amendsReportId,
  };
}
