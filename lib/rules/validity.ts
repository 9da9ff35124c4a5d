import { ReadingValidationError, RulesInputError } from './errors';
import { addDays, addMonths, assertIsoDate, type IsoDate } from './dates';
import { familyOf, type FieldTestInput } from './field-test';
import { gradeFieldTest } from './grading';
import { defaultRuleSet, type RuleSet } from './rule-sets';
import { formatPsid, kpaToPsid, formatReading } from './units';

/** 'error' = the report cannot be accepted as filed; 'warning' = the inspector should look. */
export type ValiditySeverity = 'error' | 'warning';

/** What a report's validity check can find. */
export type ValidityCode =
  | 'certification_missing'
  | 'certification_expired'
  | 'certification_not_yet_valid'
  | 'kit_verification_missing'
  | 'kit_verification_expired'
  | 'kit_verified_after_test'
  | 'test_date_in_future'
  | 'test_before_installation'
  | 'test_after_removal'
  | 'late_filing'
  | 'reading_invalid'
  | 'retest_kind_mismatch'
  | 'relief_not_below_check1'
  | 'air_inlet_fully_open_without_opening'
  | 'line_pressure_missing'
  | 'line_pressure_invalid'
  | 'line_pressure_not_above_readings';

/** One validity finding; `field` names the input it concerns when there is one. */
export interface ValidityIssue {
  code: ValidityCode;
  severity: ValiditySeverity;
  field?: string;
  message: string;
}

/**
 * A stale or missing kit verification: 'refuse' makes it an error (the report cannot be
 * submitted), 'flag' a warning for the inspector. A program setting (kit verification within
 * 12 months: Texas city policy citing state practice [S]; Oregon OAR 333-061-0070(6) [P]).
 */
export type KitPolicy = 'refuse' | 'flag';

/** Everything needed to judge a report on its test date. */
export interface ReportValidityInput {
  testDate: IsoDate;
  today: IsoDate;
  /** Last day the tester's certification is valid (inclusive); null = none on file. */
  certificationExpiresOn: IsoDate | null;
  certificationIssuedOn?: IsoDate | null;
  /** Date of the kit's last accuracy verification on or before the test; null = none on file. */
  kitVerifiedOn: IsoDate | null;
  installedOn?: IsoDate | null;
  removedOn?: IsoDate | null;
  /** When the report was filed; with reportDeadlineDays gives the late-filing warning. */
  submittedOn?: IsoDate | null;
  /** Days allowed from test to filing; default 10 calendar days (local rules say 5 to 30 [S]). */
  reportDeadlineDays?: number;
  input: FieldTestInput;
  retest?: FieldTestInput | null;
  /** Static line pressure in psi, as the report records it. */
  linePressurePsi?: number | null;
  ruleSet?: RuleSet;
  kitPolicy?: KitPolicy;
}

/** Default days from the test to filing the report [S: local rules range 5–30 days]. */
export const DEFAULT_REPORT_DEADLINE_DAYS = 10;

function checkReadings(input: FieldTestInput, prefix: string, ruleSet: RuleSet, issues: ValidityIssue[]): number | null {
  try {
    gradeFieldTest(input, ruleSet);
  } catch (error) {
    if (error instanceof ReadingValidationError) {
      issues.push({ code: 'reading_invalid', severity: 'error', field: `${prefix}${error.field}`, message: error.message });
      return null;
    }
    throw error;
  }
  const unit = input.unit ?? 'psid';
  const toPsid = (value: number) => (unit === 'kPa' ? kpaToPsid(value) : value);
  const family = familyOf(input.kind);
  if (family === 'rp' && typeof input.reliefValveOpeningPoint === 'number' && typeof input.check1Differential === 'number') {
    // The zone can never be held above the relief opening point: a relief valve that opens at or
    // above the check #1 differential would discharge throughout the no-flow test, so one of
    // the two readings is probably mis-recorded. A warning, not an error: the grade already
    // fails it (check #1 must exceed the relief point) and a failed test must still be filed
    // so its repair deadline runs.
    if (toPsid(input.reliefValveOpeningPoint) >= toPsid(input.check1Differential)) {
      issues.push({
        code: 'relief_not_below_check1',
        severity: 'warning',
        field: `${prefix}reliefValveOpeningPoint`,
        message: `The relief valve opening point (${formatReading(input.reliefValveOpeningPoint, unit)}) is not below the check #1 differential (${formatReading(input.check1Differential, unit)}); an RP cannot hold those readings together, so one is probably mis-recorded.`,
      });
    }
  }
  if (family === 'vb' && input.airInletOpeningPoint === null && input.airInletFullyOpen === true) {
    issues.push({
      code: 'air_inlet_fully_open_without_opening',
      severity: 'warning',
      field: `${prefix}airInletFullyOpen`,
      message: 'The air inlet is recorded as not opening yet also as opening fully; one of the two is mis-recorded.',
    });
  }
  const differentials = [input.reliefValveOpeningPoint, input.check1Differential, input.check2Differential, input.airInletOpeningPoint, input.checkDifferential];
  let highest: number | null = null;
  if (family !== 'ag') {
    for (const value of differentials) if (typeof value === 'number' && (highest === null || toPsid(value) > highest)) highest = toPsid(value);
  }
  return highest;
}

/**
 * Whether a report was valid on its test date: tester's certification, kit verification, dates
 * against today and the assembly's installation/removal, readings in range and consistent with
 * each other, line pressure. Returns issues (empty = nothing to say); throws RulesInputError only
 * for malformed parameters (a date not written YYYY-MM-DD).
 */
export function checkReportValidity(params: ReportValidityInput): ValidityIssue[] {
  const { testDate, today, certificationExpiresOn, kitVerifiedOn, input } = params;
  const ruleSet = params.ruleSet ?? defaultRuleSet;
  const kitSeverity: ValiditySeverity = (params.kitPolicy ?? 'refuse') === 'refuse' ? 'error' : 'warning';
  assertIsoDate(testDate, 'testDate');
  assertIsoDate(today, 'today');
  for (const field of ['certificationExpiresOn', 'certificationIssuedOn', 'kitVerifiedOn', 'installedOn', 'removedOn', 'submittedOn'] as const) {
    const value = params[field];
    if (value !== undefined && value !== null) assertIsoDate(value, field);
  }
  if (params.kitPolicy !== undefined && params.kitPolicy !== 'refuse' && params.kitPolicy !== 'flag') {
    throw new RulesInputError('kitPolicy', `kitPolicy must be 'refuse' or 'flag' (got ${JSON.stringify(params.kitPolicy)}).`);
  }
  const issues: ValidityIssue[] = [];

  if (testDate > today) {
    issues.push({ code: 'test_date_in_future', severity: 'error', field: 'testDate', message: `The test date ${testDate} is after today (${today}); a report can only record a test already done.` });
  }
  if (params.installedOn && testDate < params.installedOn) {
    issues.push({ code: 'test_before_installation', severity: 'error', field: 'testDate', message: `The test date ${testDate} is before the assembly was installed (${params.installedOn}).` });
  }
  if (params.removedOn && testDate > params.removedOn) {
    issues.push({ code: 'test_after_removal', severity: 'error', field: 'testDate', message: `The test date ${testDate} is after the assembly was removed (${params.removedOn}).` });
  }

  // An expired certificate may not test (Utah R309-305-8); the expiry date itself is still valid.
  if (certificationExpiresOn === null) {
    issues.push({ code: 'certification_missing', severity: 'error', field: 'certificationExpiresOn', message: 'No tester certification is on file for the test date.' });
  } else if (testDate > certificationExpiresOn) {
    issues.push({ code: 'certification_expired', severity: 'error', field: 'certificationExpiresOn', message: `The tester's certification expired on ${certificationExpiresOn}, before the test on ${testDate}; an expired certificate may not test.` });
  }
  if (params.certificationIssuedOn && testDate < params.certificationIssuedOn) {
    issues.push({ code: 'certification_not_yet_valid', severity: 'error', field: 'certificationIssuedOn', message: `The tester's certification was issued on ${params.certificationIssuedOn}, after the test on ${testDate}.` });
  }

  // Kit verified at least every verificationMaxMonths (12) months: valid through the same day
  // 12 calendar months later (2023-03-01 covers tests up to and including 2024-03-01).
  const months = ruleSet.kit.verificationMaxMonths;
  if (kitVerifiedOn === null) {
    issues.push({ code: 'kit_verification_missing', severity: kitSeverity, field: 'kitVerifiedOn', message: 'No accuracy verification of the test kit is on file.' });
  } else if (kitVerifiedOn > testDate) {
    issues.push({ code: 'kit_verified_after_test', severity: kitSeverity, field: 'kitVerifiedOn', message: `The kit's verification on file (${kitVerifiedOn}) is dated after the test on ${testDate}, so it does not show the kit was verified when used.` });
  } else if (testDate > addMonths(kitVerifiedOn, months)) {
    issues.push({ code: 'kit_verification_expired', severity: kitSeverity, field: 'kitVerifiedOn', message: `The test kit was last verified on ${kitVerifiedOn}, more than ${months} months before the test on ${testDate}.` });
  }

  if (params.submittedOn) {
    const deadlineDays = params.reportDeadlineDays ?? DEFAULT_REPORT_DEADLINE_DAYS;
    if (!Number.isInteger(deadlineDays) || deadlineDays < 0) throw new RulesInputError('reportDeadlineDays', 'reportDeadlineDays must be a whole number of days, zero or more.');
    const deadline = addDays(testDate, deadlineDays);
    if (params.submittedOn > deadline) {
      issues.push({ code: 'late_filing', severity: 'warning', field: 'submittedOn', message: `The report was filed on ${params.submittedOn}, after the ${deadlineDays}-day filing deadline of ${deadline}.` });
    }
  }

  let highest = checkReadings(input, '', ruleSet, issues);
  if (params.retest) {
    if (params.retest.kind !== input.kind) {
      issues.push({ code: 'retest_kind_mismatch', severity: 'error', field: 'retest.kind', message: `The retest is recorded for a ${params.retest.kind} but the initial test for a ${input.kind}; one report covers one assembly.` });
    } else {
      const retestHighest = checkReadings(params.retest, 'retest.', ruleSet, issues);
      if (retestHighest !== null && (highest === null || retestHighest > highest)) highest = retestHighest;
    }
  }

  if (familyOf(input.kind) !== 'ag') {
    const pressure = params.linePressurePsi;
    if (pressure === undefined || pressure === null) {
      issues.push({ code: 'line_pressure_missing', severity: 'warning', field: 'linePressurePsi', message: 'The line pressure is not recorded; the report should hold it.' });
    } else if (typeof pressure !== 'number' || !Number.isFinite(pressure) || pressure < 0) {
      issues.push({ code: 'line_pressure_invalid', severity: 'error', field: 'linePressurePsi', message: `The line pressure must be a number of psi, zero or more (got ${String(pressure)}).` });
    } else if (highest !== null && pressure <= highest) {
      // The drop across a check cannot exceed the pressure feeding it.
      issues.push({ code: 'line_pressure_not_above_readings', severity: 'warning', field: 'linePressurePsi', message: `The line pressure (${formatPsid(pressure)} psi) is not above the highest differential recorded (${formatPsid(highest)} psid); a differential cannot exceed the supply pressure.` });
    }
  }
  return issues;
}

/** True when none of the issues is an error (the report can be submitted; warnings go to the inspector). */
export function isReportValid(issues: readonly ValidityIssue[]): boolean {
  return issues.every((issue) => issue.severity !== 'error');
}
