import { ReadingValidationError, RulesInputError } from './errors';
import { addMonths, assertIsoDate, parseIsoDateTime, type IsoDate } from './dates';
import { familyOf, isAssemblyKind, type FieldTestField, type FieldTestInput, type KindFamily } from './field-test';
import { KPA_PER_PSI, roundAwayFloatNoise } from './units';

/**
 * Signs that a report may be copied or made up, for the inspector's review queue. A signal is
 * a reason to look, never a verdict: each message says plainly what was seen.
 */

/** Thresholds of the signals; all from trade experience, not a published rule [M], so configurable. */
export interface SignalOptions {
  /** Flag when this many tests or more (this one included) by one tester fall within burstWindowMinutes. */
  burstMinTests: number;
  burstWindowMinutes: number;
  /** Flag when one tester records the same readings on this many assemblies or more (this one included) on one day. */
  identicalAcrossMinAssemblies: number;
  /** Kit verification interval for the kit signal (the rule set's value, 12 months). */
  kitVerificationMaxMonths: number;
}

/** Defaults [M]: 6 tests within 60 minutes; the same readings on 5 assemblies in one day; kit verified within 12 months. */
export const defaultSignalOptions: SignalOptions = Object.freeze({
  burstMinTests: 6,
  burstWindowMinutes: 60,
  identicalAcrossMinAssemblies: 5,
  kitVerificationMaxMonths: 12,
});

/** What a signal is about. */
export type SignalCode =
  | 'same_as_previous_test'
  | 'many_tests_in_short_time'
  | 'identical_readings_across_assemblies'
  | 'certification_invalid_on_test_date'
  | 'kit_invalid_on_test_date'
  | 'test_before_installation';

/** One signal: a code for filters and a plain sentence for the inspector. */
export interface SuspiciousSignal {
  code: SignalCode;
  message: string;
}

const fingerprintFields: Readonly<Record<KindFamily, readonly FieldTestField[]>> = {
  rp: ['reliefValveOpeningPoint', 'check1Differential', 'check1ClosedTight', 'check2ClosedTight', 'check2Differential', 'shutoff2Tight'],
  dc: ['check1Differential', 'check1ClosedTight', 'check2Differential', 'check2ClosedTight', 'shutoff2Tight'],
  vb: ['airInletOpeningPoint', 'airInletFullyOpen', 'checkDifferential', 'checkClosedTight'],
  ag: ['supplyPipeDiameterInches', 'airGapInches', 'nearSideWall'],
};

const inchFields = new Set<FieldTestField>(['supplyPipeDiameterInches', 'airGapInches']);

/**
 * A canonical string of a reading set, to store in an indexed column and find identical ones:
 * 'v1|<family>|' + each field of the family in a fixed order, differentials in psid to the
 * tenth (kPa converted first), inches to the tenth, T/F for yes/no, 'x' for "did not open",
 * '-' for not recorded. RP and RPDA share the family 'rp' (as DC/DCDA 'dc', PVB/SVB 'vb'), so
 * a reading set copied between them still matches. Example: 'v1|rp|2.5|6.0|T|T|-|T'.
 */
export function readingFingerprint(input: FieldTestInput): string {
  if (input === null || typeof input !== 'object' || !isAssemblyKind(input.kind)) {
    throw new ReadingValidationError('kind', 'A reading fingerprint needs a field test with a known assembly kind.');
  }
  const family = familyOf(input.kind);
  const isKpa = input.unit === 'kPa';
  let fingerprint = `v1|${family}`;
  for (const field of fingerprintFields[family]) {
    const value = input[field] as unknown;
    if (value === undefined) fingerprint += '|-';
    else if (value === null) fingerprint += field === 'reliefValveOpeningPoint' || field === 'airInletOpeningPoint' ? '|x' : '|-';
    else if (typeof value === 'boolean') fingerprint += value ? '|T' : '|F';
    else if (typeof value === 'number' && Number.isFinite(value) && value >= 0) {
      const inUnit = inchFields.has(field) || !isKpa ? value : value / KPA_PER_PSI;
      fingerprint += `|${(Math.round(roundAwayFloatNoise(inUnit * 10)) / 10).toFixed(1)}`;
    } else throw new ReadingValidationError(field, `${field} must be a finite number, zero or more (got ${JSON.stringify(value) ?? typeof value}).`);
  }
  return fingerprint;
}

/** True when the fingerprint holds at least one number (a reading set with nothing read cannot be "copied"). */
function hasNumericReading(fingerprint: string): boolean {
  return /\|\d/.test(fingerprint);
}

/** The fingerprint's family ('rp', 'dc', 'vb', 'ag'). */
function familyOfFingerprint(fingerprint: string): string {
  return fingerprint.split('|', 3)[1] ?? '';
}

/** The report being checked. */
export interface SignalReport {
  reportId?: string | number;
  assemblyId: string | number;
  testedOn: IsoDate;
  /** When the test was done, ISO datetime with offset; without it the burst signal is skipped. */
  testedAt?: string | null;
  input: FieldTestInput;
}

/** Small lists the server fetches for one report (each by an indexed look-up). */
export interface SignalContext {
  /** The same assembly's previous test. */
  previousTest?: { testedOn: IsoDate; fingerprint: string } | null;
  /** The same tester's other tests near this one (e.g. within ± burstWindowMinutes). */
  testerNearbyTests?: readonly { reportId?: string | number; testedAt: string }[];
  /** The same tester's other reports of the same day. */
  testerSameDayReports?: readonly { reportId?: string | number; assemblyId: string | number; fingerprint: string }[];
  /** undefined = not checked; null = none on file. */
  certificationExpiresOn?: IsoDate | null;
  certificationIssuedOn?: IsoDate | null;
  /** undefined = not checked; null = none on file. */
  kitVerifiedOn?: IsoDate | null;
  installedOn?: IsoDate | null;
  options?: Partial<SignalOptions>;
}

function resolveOptions(partial: Partial<SignalOptions> | undefined): SignalOptions {
  const options = { ...defaultSignalOptions, ...partial };
  for (const key of Object.keys(defaultSignalOptions) as (keyof SignalOptions)[]) {
    const value = options[key];
    if (!Number.isInteger(value) || value < 1) throw new RulesInputError(`options.${key}`, `${key} must be a whole number, at least 1 (got ${String(value)}).`);
  }
  return options;
}

/** The most tests in any span of `windowMinutes` that includes the report's own time. */
function countBurst(reportTime: number, otherTimes: readonly number[], windowMinutes: number): number {
  const windowMs = windowMinutes * 60_000;
  const times = [reportTime, ...otherTimes].filter((time) => Math.abs(time - reportTime) <= windowMs).sort((a, b) => a - b);
  let best = 0;
  let end = 0;
  for (let start = 0; start < times.length; start++) {
    if (times[start]! > reportTime) break;
    if (end < start) end = start;
    while (end + 1 < times.length && times[end + 1]! - times[start]! <= windowMs) end++;
    if (times[end]! >= reportTime) best = Math.max(best, end - start + 1);
  }
  return best;
}

/**
 * Suspicious-report signals for one report:
 * (a) readings identical to the tenth to the same assembly's previous test;
 * (b) burstMinTests or more tests by the tester within burstWindowMinutes, this one included;
 * (c) the same readings by the tester on identicalAcrossMinAssemblies or more assemblies that day;
 * (d) a test on a day the tester's certification or kit verification was not valid;
 * (e) a test dated before the assembly's installation.
 * Air gaps are left out of (a) and (c): a fixed gap measures the same every year and on every
 * identical fixture.
 */
export function detectSuspiciousSignals(report: SignalReport, context: SignalContext = {}): SuspiciousSignal[] {
  assertIsoDate(report.testedOn, 'testedOn');
  const options = resolveOptions(context.options);
  const signals: SuspiciousSignal[] = [];
  const fingerprint = readingFingerprint(report.input);
  const isComparable = familyOfFingerprint(fingerprint) !== 'ag' && hasNumericReading(fingerprint);

  const previous = context.previousTest;
  if (isComparable && previous && previous.fingerprint === fingerprint) {
    signals.push({ code: 'same_as_previous_test', message: `The readings are identical, to the tenth of a psid, to this assembly's previous test on ${previous.testedOn}.` });
  }

  if (report.testedAt) {
    const reportTime = parseIsoDateTime(report.testedAt, 'testedAt');
    const others = (context.testerNearbyTests ?? [])
      .filter((test) => report.reportId === undefined || test.reportId !== report.reportId)
      .map((test, index) => parseIsoDateTime(test.testedAt, `testerNearbyTests.${index}.testedAt`));
    const count = countBurst(reportTime, others, options.burstWindowMinutes);
    if (count >= options.burstMinTests) {
      signals.push({ code: 'many_tests_in_short_time', message: `The tester recorded ${count} tests within ${options.burstWindowMinutes} minutes, this one included, which is faster than tests can be done.` });
    }
  }

  if (isComparable && context.testerSameDayReports) {
    const assemblies = new Set<string>([String(report.assemblyId)]);
    for (const other of context.testerSameDayReports) {
      if (report.reportId !== undefined && other.reportId === report.reportId) continue;
      if (other.fingerprint === fingerprint) assemblies.add(String(other.assemblyId));
    }
    if (assemblies.size >= options.identicalAcrossMinAssemblies) {
      signals.push({ code: 'identical_readings_across_assemblies', message: `The tester recorded exactly these readings on ${assemblies.size} different assemblies on ${report.testedOn}.` });
    }
  }

  const testedOn = report.testedOn;
  if (context.certificationExpiresOn === null) {
    signals.push({ code: 'certification_invalid_on_test_date', message: `No tester certification was on file for the test on ${testedOn}.` });
  } else if (context.certificationExpiresOn !== undefined) {
    assertIsoDate(context.certificationExpiresOn, 'certificationExpiresOn');
    if (testedOn > context.certificationExpiresOn) {
      signals.push({ code: 'certification_invalid_on_test_date', message: `The tester's certification had expired on ${context.certificationExpiresOn}, before this test on ${testedOn}.` });
    }
  }
  if (context.certificationIssuedOn) {
    assertIsoDate(context.certificationIssuedOn, 'certificationIssuedOn');
    if (testedOn < context.certificationIssuedOn) {
      signals.push({ code: 'certification_invalid_on_test_date', message: `The tester's certification was only issued on ${context.certificationIssuedOn}, after this test on ${testedOn}.` });
    }
  }
  if (context.kitVerifiedOn === null) {
    signals.push({ code: 'kit_invalid_on_test_date', message: `No accuracy verification of the test kit was on file for the test on ${testedOn}.` });
  } else if (context.kitVerifiedOn !== undefined) {
    assertIsoDate(context.kitVerifiedOn, 'kitVerifiedOn');
    if (context.kitVerifiedOn > testedOn) {
      signals.push({ code: 'kit_invalid_on_test_date', message: `The kit's verification on file is dated ${context.kitVerifiedOn}, after this test on ${testedOn}.` });
    } else if (testedOn > addMonths(context.kitVerifiedOn, options.kitVerificationMaxMonths)) {
      signals.push({ code: 'kit_invalid_on_test_date', message: `The test kit had last been verified on ${context.kitVerifiedOn}, more than ${options.kitVerificationMaxMonths} months before this test on ${testedOn}.` });
    }
  }

  if (context.installedOn) {
    assertIsoDate(context.installedOn, 'installedOn');
    if (testedOn < context.installedOn) {
      signals.push({ code: 'test_before_installation', message: `The test on ${testedOn} is dated before the assembly was installed on ${context.installedOn}.` });
    }
  }
  return signals;
}

/** A report in a batch (e.g. an imported history or an audit of a year): carries its own context. */
export interface BatchSignalReport extends SignalReport {
  reportId: string | number;
  testerId: string | number;
  certificationExpiresOn?: IsoDate | null;
  certificationIssuedOn?: IsoDate | null;
  kitVerifiedOn?: IsoDate | null;
  installedOn?: IsoDate | null;
}

/**
 * Signals over a set of reports, with each report's context built from the set itself
 * (previous test of the same assembly, the tester's nearby and same-day reports). Returns only
 * the reports that have signals, by reportId.
 */
export function detectSuspiciousSignalsInBatch(reports: readonly BatchSignalReport[], options: Partial<SignalOptions> = {}): Map<string | number, SuspiciousSignal[]> {
  const resolved = resolveOptions(options);
  const fingerprints = new Map<BatchSignalReport, string>();
  const byAssembly = new Map<string, BatchSignalReport[]>();
  const byTesterDay = new Map<string, BatchSignalReport[]>();
  const timedByTester = new Map<string, { report: BatchSignalReport; time: number }[]>();
  for (const report of reports) {
    fingerprints.set(report, readingFingerprint(report.input));
    const assemblyKey = String(report.assemblyId);
    (byAssembly.get(assemblyKey) ?? byAssembly.set(assemblyKey, []).get(assemblyKey)!).push(report);
    const dayKey = `${String(report.testerId)}|${report.testedOn}`;
    (byTesterDay.get(dayKey) ?? byTesterDay.set(dayKey, []).get(dayKey)!).push(report);
    if (report.testedAt) {
      const testerKey = String(report.testerId);
      (timedByTester.get(testerKey) ?? timedByTester.set(testerKey, []).get(testerKey)!).push({ report, time: parseIsoDateTime(report.testedAt, 'testedAt') });
    }
  }

  const previousOf = new Map<BatchSignalReport, BatchSignalReport>();
  for (const list of byAssembly.values()) {
    const ordered = [...list].sort((a, b) => (a.testedOn < b.testedOn ? -1 : a.testedOn > b.testedOn ? 1 : (a.testedAt ?? '') < (b.testedAt ?? '') ? -1 : 0));
    for (let index = 1; index < ordered.length; index++) previousOf.set(ordered[index]!, ordered[index - 1]!);
  }
  const windowMs = resolved.burstWindowMinutes * 60_000;
  const nearbyOf = new Map<BatchSignalReport, { reportId: string | number; testedAt: string }[]>();
  for (const list of timedByTester.values()) {
    list.sort((a, b) => a.time - b.time);
    let low = 0;
    for (let index = 0; index < list.length; index++) {
      const entry = list[index]!;
      while (entry.time - list[low]!.time > windowMs) low++;
      const nearby: { reportId: string | number; testedAt: string }[] = [];
      for (let other = low; other < list.length && list[other]!.time - entry.time <= windowMs; other++) {
        if (other !== index) nearby.push({ reportId: list[other]!.report.reportId, testedAt: list[other]!.report.testedAt! });
      }
      nearbyOf.set(entry.report, nearby);
    }
  }

  const result = new Map<string | number, SuspiciousSignal[]>();
  for (const report of reports) {
    const previous = previousOf.get(report);
    const sameDay = byTesterDay.get(`${String(report.testerId)}|${report.testedOn}`) ?? [];
    const signals = detectSuspiciousSignals(report, {
      previousTest: previous ? { testedOn: previous.testedOn, fingerprint: fingerprints.get(previous)! } : null,
      testerNearbyTests: nearbyOf.get(report) ?? [],
      testerSameDayReports: sameDay.filter((other) => other !== report).map((other) => ({ reportId: other.reportId, assemblyId: other.assemblyId, fingerprint: fingerprints.get(other)! })),
      certificationExpiresOn: report.certificationExpiresOn,
      certificationIssuedOn: report.certificationIssuedOn,
      kitVerifiedOn: report.kitVerifiedOn,
      installedOn: report.installedOn,
      options: resolved,
    });
    if (signals.length > 0) result.set(report.reportId, signals);
  }
  return result;
}
