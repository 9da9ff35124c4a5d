import { ReadingValidationError, RulesInputError } from './errors';
import { familyOf, type AssemblyKind, type FieldTestField, type FieldTestInput } from './field-test';
import { defaultRuleSet, findRuleSetShapeProblems, type RuleId, type RuleSet } from './rule-sets';
import {
  COMPARISON_EPSILON_PSID,
  KPA_PER_PSI,
  formatMinimum,
  formatMinimumInKpa,
  isClearlyGreater,
  meetsMinimum,
  psidToKpa,
  roundAwayFloatNoise,
  type ReadingUnit,
} from './units';

/** One rule applied to one reading: what was observed, what was required, and the published source. */
export interface Finding {
  rule: string;
  passed: boolean;
  /** As entered (in the grade's unit for differentials, inches for air gaps); null = valve did not open. */
  observed?: number | boolean | null;
  required?: string;
  source: string;
}

/** Result of grading one set of readings. */
export type GradeOutcome = 'pass' | 'fail' | 'incomplete';

/**
 * A graded field test. Outcome: 'fail' as soon as any finding failed (every rule is a "must",
 * so a reading still to come cannot rescue it: the form shows the failure at once); otherwise
 * 'incomplete' when a needed reading is missing; otherwise 'pass'.
 */
export interface Grade {
  outcome: GradeOutcome;
  findings: Finding[];
  /** FieldTestInput field names the kind needs and the input lacks. */
  missing: string[];
  /** Unit the differential readings were entered (and are reported) in. */
  unit: ReadingUnit;
  /** The rule-set edition the readings were held to. */
  edition: string;
}

type RequiredTexts = Record<Exclude<RuleId, 'ag.gap.min' | 'ag.gap.sideWall.min'>, string>;

interface CompiledRuleSet {
  ruleSet: RuleSet;
  psidTexts: RequiredTexts;
  kpaTexts: RequiredTexts;
  rangeMaxPsid: number;
}

// Required texts are built once per rule-set object: grading runs a million times a second and
// must not format strings per call. Rule sets are immutable once in use (see rule-sets.ts).
const compiledRuleSets = new WeakMap<RuleSet, CompiledRuleSet>();

function minimumText(minimumPsid: number, unit: ReadingUnit): string {
  return unit === 'psid'
    ? `≥ ${formatMinimum(minimumPsid)} psid`
    : `≥ ${formatMinimumInKpa(minimumPsid)} kPa (${formatMinimum(minimumPsid)} psid)`;
}

function buildTexts(ruleSet: RuleSet, unit: ReadingUnit): RequiredTexts {
  const closedTight = 'closed tight';
  const shutoff = 'tight (if it leaks, no-flow was not reached and the readings are not valid)';
  return {
    'rp.relief.min': `${minimumText(ruleSet.rp.reliefMin, unit)}; not opening fails`,
    'rp.check1.min': minimumText(ruleSet.rp.check1Min, unit),
    'rp.check1.tight': closedTight,
    'rp.check1.exceedsRelief': `> 0.0 ${unit} (check #1 greater than the relief valve opening point)`,
    'rp.buffer.min': `${ruleSet.rp.bufferMin === null ? '' : minimumText(ruleSet.rp.bufferMin, unit)} (check #1 minus the relief valve opening point)`,
    'rp.check2.tight': 'held tight against backpressure',
    'rp.check2.flow.min': ruleSet.rp.check2FlowMin === null ? '' : minimumText(ruleSet.rp.check2FlowMin, unit),
    'rp.shutoff2.tight': shutoff,
    'dc.check1.min': minimumText(ruleSet.dc.check1Min, unit),
    'dc.check1.tight': closedTight,
    'dc.check2.min': minimumText(ruleSet.dc.check2Min, unit),
    'dc.check2.tight': closedTight,
    'dc.shutoff2.tight': shutoff,
    'pvb.airInlet.min': `${minimumText(ruleSet.pvb.airInletMin, unit)}; not opening fails`,
    'pvb.airInlet.fullyOpen': 'opened fully',
    'pvb.check.min': minimumText(ruleSet.pvb.checkMin, unit),
    'pvb.check.tight': closedTight,
    'svb.airInlet.min': `${minimumText(ruleSet.svb.airInletMin, unit)}; not opening fails`,
    'svb.airInlet.fullyOpen': 'opened fully',
    'svb.check.min': minimumText(ruleSet.svb.checkMin, unit),
    'svb.check.tight': closedTight,
  };
}

function compileRuleSet(ruleSet: RuleSet): CompiledRuleSet {
  let compiled = compiledRuleSets.get(ruleSet);
  if (compiled) return compiled;
  const problems = findRuleSetShapeProblems(ruleSet);
  if (problems.length > 0) {
    throw new RulesInputError('ruleSet', `The rule set cannot be used: ${problems.map((problem) => problem.message).join(' ')}`);
  }
  compiled = {
    ruleSet,
    psidTexts: buildTexts(ruleSet, 'psid'),
    kpaTexts: buildTexts(ruleSet, 'kPa'),
    rangeMaxPsid: ruleSet.gauge.rangeMaxPsid,
  };
  compiledRuleSets.set(ruleSet, compiled);
  return compiled;
}

function describeValue(value: unknown): string {
  return typeof value === 'number' ? String(value) : JSON.stringify(value) ?? String(value);
}

/** Validates a differential reading and returns it in psid; throws for anything that cannot be a gauge reading. */
function toPsidOrThrow(value: unknown, field: FieldTestField, isKpa: boolean, rangeMaxPsid: number): number {
  if (typeof value !== 'number') {
    throw new ReadingValidationError(field, `${field} must be a number (got ${describeValue(value)}).`);
  }
  if (!Number.isFinite(value)) {
    throw new ReadingValidationError(field, `${field} must be a finite number (got ${describeValue(value)}).`);
  }
  if (value < 0) {
    throw new ReadingValidationError(field, `${field} cannot be negative (got ${value}): a differential gauge reads from 0.`);
  }
  const psid = isKpa ? value / KPA_PER_PSI : value;
  if (psid > rangeMaxPsid + COMPARISON_EPSILON_PSID) {
    throw new ReadingValidationError(
      field,
      `${field} is ${value} ${isKpa ? 'kPa' : 'psid'}, above the gauge's range of ${formatMinimum(rangeMaxPsid)} psid (${formatMinimum(psidToKpa(rangeMaxPsid))} kPa): re-read the gauge.`,
    );
  }
  return psid;
}

function toInchesOrThrow(value: unknown, field: FieldTestField, mustBePositive: boolean): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ReadingValidationError(field, `${field} must be a finite number of inches (got ${describeValue(value)}).`);
  }
  if (value < 0 || (mustBePositive && value === 0)) {
    throw new ReadingValidationError(field, `${field} must be ${mustBePositive ? 'greater than zero' : 'zero or more'} inches (got ${value}).`);
  }
  return value;
}

/** undefined/null = not recorded; anything but a boolean is refused. */
function readFlag(value: unknown, field: FieldTestField): boolean | undefined {
  if (value === undefined || value === null) return undefined;
  if (typeof value !== 'boolean') throw new ReadingValidationError(field, `${field} must be true or false (got ${describeValue(value)}).`);
  return value;
}

function readUnit(unit: unknown): ReadingUnit {
  if (unit === undefined || unit === 'psid') return 'psid';
  if (unit === 'kPa') return 'kPa';
  throw new ReadingValidationError('unit', `unit must be 'psid' or 'kPa' (got ${describeValue(unit)}).`);
}

function makeFinding(rule: RuleId, passed: boolean, observed: number | boolean | null, required: string, source: string): Finding {
  return { rule, passed, observed, required, source };
}

function makeGrade(findings: Finding[], missing: string[], failed: boolean, unit: ReadingUnit, edition: string): Grade {
  return { outcome: failed ? 'fail' : missing.length > 0 ? 'incomplete' : 'pass', findings, missing, unit, edition };
}

function gradeReducedPressure(input: FieldTestInput, compiled: CompiledRuleSet, unit: ReadingUnit): Grade {
  const { ruleSet, rangeMaxPsid } = compiled;
  const rules = ruleSet.rp;
  const sources = ruleSet.sources;
  const texts = unit === 'kPa' ? compiled.kpaTexts : compiled.psidTexts;
  const isKpa = unit === 'kPa';
  const findings: Finding[] = [];
  const missing: string[] = [];
  let failed = false;

  const reliefRaw = input.reliefValveOpeningPoint;
  let reliefPsid = NaN;
  if (reliefRaw === undefined) missing.push('reliefValveOpeningPoint');
  else if (reliefRaw === null) {
    // EPA 2003, Fig. 39: a relief valve that does not open fails.
    findings.push(makeFinding('rp.relief.min', false, null, texts['rp.relief.min'], sources['rp.relief.min']));
    failed = true;
  } else {
    reliefPsid = toPsidOrThrow(reliefRaw, 'reliefValveOpeningPoint', isKpa, rangeMaxPsid);
    const passed = meetsMinimum(reliefPsid, rules.reliefMin);
    findings.push(makeFinding('rp.relief.min', passed, reliefRaw, texts['rp.relief.min'], sources['rp.relief.min']));
    if (!passed) failed = true;
  }

  const check1Raw = input.check1Differential as unknown;
  let check1Psid = NaN;
  if (check1Raw === undefined || check1Raw === null) missing.push('check1Differential');
  else {
    check1Psid = toPsidOrThrow(check1Raw, 'check1Differential', isKpa, rangeMaxPsid);
    const passed = meetsMinimum(check1Psid, rules.check1Min);
    findings.push(makeFinding('rp.check1.min', passed, check1Raw as number, texts['rp.check1.min'], sources['rp.check1.min']));
    if (!passed) failed = true;
  }

  const check1Tight = readFlag(input.check1ClosedTight, 'check1ClosedTight');
  if (check1Tight === undefined) missing.push('check1ClosedTight');
  else {
    findings.push(makeFinding('rp.check1.tight', check1Tight, check1Tight, texts['rp.check1.tight'], sources['rp.check1.tight']));
    if (!check1Tight) failed = true;
  }

  // The two relief comparisons apply only when the relief valve opened and check #1 was read.
  if (reliefPsid === reliefPsid && check1Psid === check1Psid) {
    const margin = roundAwayFloatNoise((check1Raw as number) - (reliefRaw as number));
    if (rules.check1MustExceedRelief) {
      const passed = isClearlyGreater(check1Psid, reliefPsid);
      findings.push(makeFinding('rp.check1.exceedsRelief', passed, margin, texts['rp.check1.exceedsRelief'], sources['rp.check1.exceedsRelief']));
      if (!passed) failed = true;
    }
    if (rules.bufferMin !== null) {
      const passed = meetsMinimum(check1Psid - reliefPsid, rules.bufferMin);
      findings.push(makeFinding('rp.buffer.min', passed, margin, texts['rp.buffer.min'], sources['rp.buffer.min']));
      if (!passed) failed = true;
    }
  }

  const check2Tight = readFlag(input.check2ClosedTight, 'check2ClosedTight');
  if (check2Tight === undefined) missing.push('check2ClosedTight');
  else {
    findings.push(makeFinding('rp.check2.tight', check2Tight, check2Tight, texts['rp.check2.tight'], sources['rp.check2.tight']));
    if (!check2Tight) failed = true;
  }

  const check2Raw = input.check2Differential as unknown;
  if (check2Raw === undefined || check2Raw === null) {
    if (rules.check2FlowMin !== null) missing.push('check2Differential');
  } else {
    const check2Psid = toPsidOrThrow(check2Raw, 'check2Differential', isKpa, rangeMaxPsid);
    if (rules.check2FlowMin !== null) {
      const passed = meetsMinimum(check2Psid, rules.check2FlowMin);
      findings.push(makeFinding('rp.check2.flow.min', passed, check2Raw as number, texts['rp.check2.flow.min'], sources['rp.check2.flow.min']));
      if (!passed) failed = true;
    }
  }

  const shutoffTight = readFlag(input.shutoff2Tight, 'shutoff2Tight');
  if (shutoffTight === undefined) missing.push('shutoff2Tight');
  else {
    findings.push(makeFinding('rp.shutoff2.tight', shutoffTight, shutoffTight, texts['rp.shutoff2.tight'], sources['rp.shutoff2.tight']));
    if (!shutoffTight) failed = true;
  }

  return makeGrade(findings, missing, failed, unit, ruleSet.edition);
}

function gradeDoubleCheck(input: FieldTestInput, compiled: CompiledRuleSet, unit: ReadingUnit): Grade {
  const { ruleSet, rangeMaxPsid } = compiled;
  const rules = ruleSet.dc;
  const sources = ruleSet.sources;
  const texts = unit === 'kPa' ? compiled.kpaTexts : compiled.psidTexts;
  const isKpa = unit === 'kPa';
  const findings: Finding[] = [];
  const missing: string[] = [];
  let failed = false;

  const check1Raw = input.check1Differential as unknown;
  if (check1Raw === undefined || check1Raw === null) missing.push('check1Differential');
  else {
    const passed = meetsMinimum(toPsidOrThrow(check1Raw, 'check1Differential', isKpa, rangeMaxPsid), rules.check1Min);
    findings.push(makeFinding('dc.check1.min', passed, check1Raw as number, texts['dc.check1.min'], sources['dc.check1.min']));
    if (!passed) failed = true;
  }

  const check1Tight = readFlag(input.check1ClosedTight, 'check1ClosedTight');
  if (check1Tight === undefined) missing.push('check1ClosedTight');
  else {
    findings.push(makeFinding('dc.check1.tight', check1Tight, check1Tight, texts['dc.check1.tight'], sources['dc.check1.tight']));
    if (!check1Tight) failed = true;
  }

  const check2Raw = input.check2Differential as unknown;
  if (check2Raw === undefined || check2Raw === null) missing.push('check2Differential');
  else {
    const passed = meetsMinimum(toPsidOrThrow(check2Raw, 'check2Differential', isKpa, rangeMaxPsid), rules.check2Min);
    findings.push(makeFinding('dc.check2.min', passed, check2Raw as number, texts['dc.check2.min'], sources['dc.check2.min']));
    if (!passed) failed = true;
  }

  // Optional on a DC: recorded as a finding when the tester gave it.
  const check2Tight = readFlag(input.check2ClosedTight, 'check2ClosedTight');
  if (check2Tight !== undefined) {
    findings.push(makeFinding('dc.check2.tight', check2Tight, check2Tight, texts['dc.check2.tight'], sources['dc.check2.tight']));
    if (!check2Tight) failed = true;
  }

  const shutoffTight = readFlag(input.shutoff2Tight, 'shutoff2Tight');
  if (shutoffTight === undefined) missing.push('shutoff2Tight');
  else {
    findings.push(makeFinding('dc.shutoff2.tight', shutoffTight, shutoffTight, texts['dc.shutoff2.tight'], sources['dc.shutoff2.tight']));
    if (!shutoffTight) failed = true;
  }

  return makeGrade(findings, missing, failed, unit, ruleSet.edition);
}

const vacuumBreakerRuleIds = {
  PVB: { inlet: 'pvb.airInlet.min', fullyOpen: 'pvb.airInlet.fullyOpen', check: 'pvb.check.min', tight: 'pvb.check.tight' },
  SVB: { inlet: 'svb.airInlet.min', fullyOpen: 'svb.airInlet.fullyOpen', check: 'svb.check.min', tight: 'svb.check.tight' },
} as const;

function gradeVacuumBreaker(input: FieldTestInput, kind: 'PVB' | 'SVB', compiled: CompiledRuleSet, unit: ReadingUnit): Grade {
  const { ruleSet, rangeMaxPsid } = compiled;
  const rules = kind === 'PVB' ? ruleSet.pvb : ruleSet.svb;
  const ids = vacuumBreakerRuleIds[kind];
  const sources = ruleSet.sources;
  const texts = unit === 'kPa' ? compiled.kpaTexts : compiled.psidTexts;
  const isKpa = unit === 'kPa';
  const findings: Finding[] = [];
  const missing: string[] = [];
  let failed = false;

  const inletRaw = input.airInletOpeningPoint;
  if (inletRaw === undefined) missing.push('airInletOpeningPoint');
  else if (inletRaw === null) {
    findings.push(makeFinding(ids.inlet, false, null, texts[ids.inlet], sources[ids.inlet]));
    failed = true;
  } else {
    const passed = meetsMinimum(toPsidOrThrow(inletRaw, 'airInletOpeningPoint', isKpa, rangeMaxPsid), rules.airInletMin);
    findings.push(makeFinding(ids.inlet, passed, inletRaw, texts[ids.inlet], sources[ids.inlet]));
    if (!passed) failed = true;
  }

  // An air inlet that never opened cannot be asked whether it opened fully: not required then,
  // but recorded if the tester gave it.
  const fullyOpen = readFlag(input.airInletFullyOpen, 'airInletFullyOpen');
  if (fullyOpen === undefined) {
    if (inletRaw !== null) missing.push('airInletFullyOpen');
  } else {
    findings.push(makeFinding(ids.fullyOpen, fullyOpen, fullyOpen, texts[ids.fullyOpen], sources[ids.fullyOpen]));
    if (!fullyOpen) failed = true;
  }

  const checkRaw = input.checkDifferential as unknown;
  if (checkRaw === undefined || checkRaw === null) missing.push('checkDifferential');
  else {
    const passed = meetsMinimum(toPsidOrThrow(checkRaw, 'checkDifferential', isKpa, rangeMaxPsid), rules.checkMin);
    findings.push(makeFinding(ids.check, passed, checkRaw as number, texts[ids.check], sources[ids.check]));
    if (!passed) failed = true;
  }

  const checkTight = readFlag(input.checkClosedTight, 'checkClosedTight');
  if (checkTight === undefined) missing.push('checkClosedTight');
  else {
    findings.push(makeFinding(ids.tight, checkTight, checkTight, texts[ids.tight], sources[ids.tight]));
    if (!checkTight) failed = true;
  }

  return makeGrade(findings, missing, failed, unit, ruleSet.edition);
}

/** The air gap an opening needs: factor × supply pipe diameter, never under the floor (inches). */
export function requiredAirGapInches(supplyPipeDiameterInches: number, isNearSideWall: boolean, ruleSet: RuleSet = defaultRuleSet): number {
  const { diameterFactor, minInches, sideWallFactor, sideWallMinInches } = ruleSet.airGap;
  return isNearSideWall
    ? Math.max(sideWallFactor * supplyPipeDiameterInches, sideWallMinInches)
    : Math.max(diameterFactor * supplyPipeDiameterInches, minInches);
}

function gradeAirGap(input: FieldTestInput, compiled: CompiledRuleSet, unit: ReadingUnit): Grade {
  const { ruleSet } = compiled;
  const findings: Finding[] = [];
  const missing: string[] = [];
  let failed = false;

  const diameterRaw = input.supplyPipeDiameterInches as unknown;
  const gapRaw = input.airGapInches as unknown;
  const diameter = diameterRaw === undefined || diameterRaw === null ? undefined : toInchesOrThrow(diameterRaw, 'supplyPipeDiameterInches', true);
  const gap = gapRaw === undefined || gapRaw === null ? undefined : toInchesOrThrow(gapRaw, 'airGapInches', false);
  const isNearSideWall = readFlag(input.nearSideWall, 'nearSideWall');
  if (diameter === undefined) missing.push('supplyPipeDiameterInches');
  if (gap === undefined) missing.push('airGapInches');
  if (isNearSideWall === undefined) missing.push('nearSideWall');

  if (diameter !== undefined && gap !== undefined && isNearSideWall !== undefined) {
    const rule: RuleId = isNearSideWall ? 'ag.gap.sideWall.min' : 'ag.gap.min';
    const factor = isNearSideWall ? ruleSet.airGap.sideWallFactor : ruleSet.airGap.diameterFactor;
    const floor = isNearSideWall ? ruleSet.airGap.sideWallMinInches : ruleSet.airGap.minInches;
    const minimum = requiredAirGapInches(diameter, isNearSideWall, ruleSet);
    const passed = meetsMinimum(gap, minimum);
    const required = `≥ ${formatMinimum(minimum)} in. (${String(roundAwayFloatNoise(factor))} × ${String(roundAwayFloatNoise(diameter))} in. supply pipe, never under ${formatMinimum(floor)} in.)`;
    findings.push(makeFinding(rule, passed, gap, required, ruleSet.sources[rule]));
    if (!passed) failed = true;
  }

  return makeGrade(findings, missing, failed, unit, ruleSet.edition);
}

/**
 * Grades one set of field-test readings against a rule-set edition (default: the current
 * published minimums). A reading exactly at a minimum passes. kPa readings are converted to psid
 * exactly before any comparison. Never throws for a missing reading (→ 'incomplete'); throws
 * ReadingValidationError for a reading no gauge could give (negative, NaN, ±Infinity, above the
 * gauge's range) or a value of the wrong type.
 */
export function gradeFieldTest(input: FieldTestInput, ruleSet: RuleSet = defaultRuleSet): Grade {
  if (input === null || typeof input !== 'object') throw new ReadingValidationError('kind', 'A field test must be an object with its assembly kind.');
  const compiled = compileRuleSet(ruleSet);
  const unit = readUnit(input.unit);
  switch (input.kind) {
    case 'RP':
    case 'RPDA':
      return gradeReducedPressure(input, compiled, unit);
    case 'DC':
    case 'DCDA':
      return gradeDoubleCheck(input, compiled, unit);
    case 'PVB':
    case 'SVB':
      return gradeVacuumBreaker(input, input.kind, compiled, unit);
    case 'AG':
      return gradeAirGap(input, compiled, unit);
    default:
      throw new ReadingValidationError('kind', `Unknown assembly kind ${describeValue((input as { kind: unknown }).kind)}.`);
  }
}

/** Initial test plus, after repairs, the retest on the same report. */
export interface ReportReadings {
  initial: FieldTestInput;
  retest?: FieldTestInput | null;
  ruleSet?: RuleSet;
}

/** A graded report: the final outcome is the retest's when there is one. */
export interface ReportGrade {
  initial: Grade;
  retest?: Grade;
  outcome: GradeOutcome;
  /** The initial test failed and the retest after repair passed. */
  passedAfterRepair: boolean;
}

/** Grades a report's initial test and retest together; the retest must be of the same kind. */
export function gradeReport({ initial, retest, ruleSet = defaultRuleSet }: ReportReadings): ReportGrade {
  const initialGrade = gradeFieldTest(initial, ruleSet);
  if (retest === undefined || retest === null) {
    return { initial: initialGrade, outcome: initialGrade.outcome, passedAfterRepair: false };
  }
  if (retest.kind !== initial.kind) {
    throw new ReadingValidationError('retest.kind', `The retest is of kind ${describeValue(retest.kind)} but the initial test of ${describeValue(initial.kind)}: one report covers one assembly.`);
  }
  const retestGrade = gradeFieldTest(retest, ruleSet);
  return {
    initial: initialGrade,
    retest: retestGrade,
    outcome: retestGrade.outcome,
    passedAfterRepair: initialGrade.outcome === 'fail' && retestGrade.outcome === 'pass',
  };
}

/**
 * Fields a kind must record for a complete grade, in form order. (A PVB/SVB's
 * airInletFullyOpen is not needed when the air inlet did not open at all.)
 */
export function requiredFields(kind: AssemblyKind, ruleSet: RuleSet = defaultRuleSet): readonly FieldTestField[] {
  switch (familyOf(kind)) {
    case 'rp':
      return ruleSet.rp.check2FlowMin === null
        ? ['reliefValveOpeningPoint', 'check1Differential', 'check1ClosedTight', 'check2ClosedTight', 'shutoff2Tight']
        : ['reliefValveOpeningPoint', 'check1Differential', 'check1ClosedTight', 'check2ClosedTight', 'check2Differential', 'shutoff2Tight'];
    case 'dc':
      return ['check1Differential', 'check1ClosedTight', 'check2Differential', 'shutoff2Tight'];
    case 'vb':
      return ['airInletOpeningPoint', 'airInletFullyOpen', 'checkDifferential', 'checkClosedTight'];
    case 'ag':
      return ['supplyPipeDiameterInches', 'airGapInches', 'nearSideWall'];
  }
}

/** Fields a kind may record beyond the required ones (range-checked when given; graded where a rule uses them). */
export function optionalFields(kind: AssemblyKind, ruleSet: RuleSet = defaultRuleSet): readonly FieldTestField[] {
  switch (familyOf(kind)) {
    case 'rp':
      return ruleSet.rp.check2FlowMin === null ? ['check2Differential'] : [];
    case 'dc':
      return ['check2ClosedTight'];
    case 'vb':
    case 'ag':
      return [];
  }
}
