import { describe, expect, it } from 'vitest';
import {
  defaultSignalOptions,
  detectSuspiciousSignals,
  detectSuspiciousSignalsInBatch,
  psidToKpa,
  readingFingerprint,
  type BatchSignalReport,
  type FieldTestInput,
  type SignalReport,
} from '@/lib/rules';

const rpReadings: FieldTestInput = { kind: 'RP', reliefValveOpeningPoint: 2.5, check1Differential: 6.0, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };
const report: SignalReport = { reportId: 'r-1', assemblyId: 'asm-1', testedOn: '2024-05-02', testedAt: '2024-05-02T14:00:00Z', input: rpReadings };

describe('readingFingerprint', () => {
  it('is canonical: readings to the tenth in psid, kPa converted, RP and RPDA alike', () => {
    expect(readingFingerprint(rpReadings)).toBe('v1|rp|2.5|6.0|T|T|-|T');
    expect(readingFingerprint({ ...rpReadings, kind: 'RPDA', reliefValveOpeningPoint: 2.54, check1Differential: 5.96 })).toBe('v1|rp|2.5|6.0|T|T|-|T');
    expect(readingFingerprint({ ...rpReadings, unit: 'kPa', reliefValveOpeningPoint: psidToKpa(2.5), check1Differential: psidToKpa(6) })).toBe('v1|rp|2.5|6.0|T|T|-|T');
    expect(readingFingerprint({ ...rpReadings, reliefValveOpeningPoint: null })).toBe('v1|rp|x|6.0|T|T|-|T');
    expect(readingFingerprint({ kind: 'DC', check1Differential: 1.25, check2Differential: 2 })).toBe('v1|dc|1.3|-|2.0|-|-');
    expect(readingFingerprint({ kind: 'SVB', airInletOpeningPoint: 1.3, airInletFullyOpen: false, checkDifferential: 1.1, checkClosedTight: true })).toBe('v1|vb|1.3|F|1.1|T');
    expect(readingFingerprint({ kind: 'AG', supplyPipeDiameterInches: 0.75, airGapInches: 2, nearSideWall: false })).toBe('v1|ag|0.8|2.0|F');
  });

  it('refuses readings that are not numbers', () => {
    expect(() => readingFingerprint({ ...rpReadings, check1Differential: Number.NaN })).toThrow(/check1Differential/);
  });
});

describe('detectSuspiciousSignals', () => {
  it('finds nothing on an ordinary report', () => {
    expect(detectSuspiciousSignals(report, { previousTest: { testedOn: '2023-05-04', fingerprint: 'v1|rp|2.8|6.4|T|T|-|T' }, certificationExpiresOn: '2025-01-01', kitVerifiedOn: '2024-01-10', installedOn: '2018-01-01' })).toEqual([]);
  });

  it('(a) flags readings identical to the previous test to the tenth', () => {
    const signals = detectSuspiciousSignals(report, { previousTest: { testedOn: '2023-05-04', fingerprint: readingFingerprint({ ...rpReadings, check1Differential: 6.04 }) } });
    expect(signals).toEqual([{ code: 'same_as_previous_test', message: "The readings are identical, to the tenth of a psid, to this assembly's previous test on 2023-05-04." }]);
  });

  it('(a) leaves air gaps out: a fixed gap measures the same every year', () => {
    const input: FieldTestInput = { kind: 'AG', supplyPipeDiameterInches: 1, airGapInches: 2.5, nearSideWall: false };
    expect(detectSuspiciousSignals({ ...report, input }, { previousTest: { testedOn: '2023-05-04', fingerprint: readingFingerprint(input) } })).toEqual([]);
  });

  it('(b) flags 6 tests within 60 minutes by default, this one included', () => {
    // Defaults are from trade experience [M]: 6 within 60 minutes.
    expect(defaultSignalOptions).toMatchObject({ burstMinTests: 6, burstWindowMinutes: 60, identicalAcrossMinAssemblies: 5 });
    const fiveOthers = ['13:10', '13:25', '13:40', '13:55', '14:05'].map((time, index) => ({ reportId: `o-${index}`, testedAt: `2024-05-02T${time}:00Z` }));
    const signals = detectSuspiciousSignals(report, { testerNearbyTests: fiveOthers });
    expect(signals.map((signal) => signal.code)).toEqual(['many_tests_in_short_time']);
    expect(signals[0]!.message).toBe('The tester recorded 6 tests within 60 minutes, this one included, which is faster than tests can be done.');
    // Four others, or the same five spread over more than an hour, are not flagged; the report itself is not counted twice.
    expect(detectSuspiciousSignals(report, { testerNearbyTests: fiveOthers.slice(1) })).toEqual([]);
    expect(detectSuspiciousSignals(report, { testerNearbyTests: [...fiveOthers.slice(1), { reportId: 'r-1', testedAt: report.testedAt! }] })).toEqual([]);
    const spread = ['12:10', '12:40', '13:10', '13:40', '14:50'].map((time) => ({ testedAt: `2024-05-02T${time}:00Z` }));
    expect(detectSuspiciousSignals(report, { testerNearbyTests: spread })).toEqual([]);
    expect(detectSuspiciousSignals(report, { testerNearbyTests: fiveOthers.slice(1), options: { burstMinTests: 5 } })).toHaveLength(1);
  });

  it('(b) counts a window of exactly 60 minutes and compares offsets correctly', () => {
    const others = ['13:00', '13:15', '13:30', '13:45'].map((time) => ({ testedAt: `2024-05-02T${time}:00Z` }));
    expect(detectSuspiciousSignals(report, { testerNearbyTests: [...others, { testedAt: '2024-05-02T15:00:00+01:00' }] })).toHaveLength(1);
    // One second more and the first test falls outside every 60-minute span that holds six.
    expect(detectSuspiciousSignals(report, { testerNearbyTests: [...others, { testedAt: '2024-05-02T15:00:01+01:00' }] })).toEqual([]);
    expect(detectSuspiciousSignals(report, { testerNearbyTests: [...others.slice(1), { testedAt: '2024-05-02T12:59:59Z' }, { testedAt: '2024-05-02T15:00:01Z' }] })).toEqual([]);
  });

  it('(c) flags the same readings on 5 assemblies by one tester on one day', () => {
    const fingerprint = readingFingerprint(rpReadings);
    const sameDay = ['asm-2', 'asm-3', 'asm-4', 'asm-5'].map((assemblyId, index) => ({ reportId: `s-${index}`, assemblyId, fingerprint }));
    const signals = detectSuspiciousSignals(report, { testerSameDayReports: sameDay });
    expect(signals).toEqual([{ code: 'identical_readings_across_assemblies', message: 'The tester recorded exactly these readings on 5 different assemblies on 2024-05-02.' }]);
    expect(detectSuspiciousSignals(report, { testerSameDayReports: [...sameDay.slice(1), { assemblyId: 'asm-2', fingerprint: 'v1|rp|2.6|6.0|T|T|-|T' }] })).toEqual([]);
    // The same assembly twice counts once.
    expect(detectSuspiciousSignals(report, { testerSameDayReports: [...sameDay.slice(1), { assemblyId: 'asm-1', fingerprint }] })).toEqual([]);
  });

  it('(d) flags a test on a day the certification or the kit was not valid', () => {
    const codes = (context: Parameters<typeof detectSuspiciousSignals>[1]) => detectSuspiciousSignals(report, context).map((signal) => signal.code);
    expect(codes({ certificationExpiresOn: '2024-05-01' })).toEqual(['certification_invalid_on_test_date']);
    expect(codes({ certificationExpiresOn: '2024-05-02' })).toEqual([]);
    expect(codes({ certificationExpiresOn: null })).toEqual(['certification_invalid_on_test_date']);
    expect(codes({ kitVerifiedOn: '2023-05-01' })).toEqual(['kit_invalid_on_test_date']);
    expect(codes({ kitVerifiedOn: '2023-05-02' })).toEqual([]);
    expect(codes({ kitVerifiedOn: '2024-05-03' })).toEqual(['kit_invalid_on_test_date']);
    expect(detectSuspiciousSignals(report, { kitVerifiedOn: '2023-05-01' })[0]!.message).toBe('The test kit had last been verified on 2023-05-01, more than 12 months before this test on 2024-05-02.');
  });

  it('(e) flags a test before installation', () => {
    expect(detectSuspiciousSignals(report, { installedOn: '2024-05-03' })).toEqual([{ code: 'test_before_installation', message: 'The test on 2024-05-02 is dated before the assembly was installed on 2024-05-03.' }]);
    expect(detectSuspiciousSignals(report, { installedOn: '2024-05-02' })).toEqual([]);
  });

  it('skips the burst check without a time, and refuses a time without an offset', () => {
    expect(detectSuspiciousSignals({ ...report, testedAt: null }, { testerNearbyTests: [{ testedAt: '2024-05-02T14:00:00Z' }] })).toEqual([]);
    expect(() => detectSuspiciousSignals({ ...report, testedAt: '2024-05-02T14:00:00' })).toThrow(/offset/);
  });
});

describe('detectSuspiciousSignalsInBatch', () => {
  it('builds each report context from the set itself', () => {
    const base = { testerId: 't-1', certificationExpiresOn: '2026-01-01', kitVerifiedOn: '2024-01-15' } as const;
    const dcReadings: FieldTestInput = { kind: 'DC', check1Differential: 2.1, check1ClosedTight: true, check2Differential: 1.8, shutoff2Tight: true };
    const reports: BatchSignalReport[] = [
      { ...base, reportId: 'p-1', assemblyId: 'asm-1', testedOn: '2023-05-04', testedAt: '2023-05-04T09:00:00Z', kitVerifiedOn: '2023-01-10', input: rpReadings },
      { ...base, reportId: 'p-2', assemblyId: 'asm-1', testedOn: '2024-05-02', testedAt: '2024-05-02T08:00:00Z', input: rpReadings },
      ...['asm-2', 'asm-3', 'asm-4', 'asm-5', 'asm-6'].map((assemblyId, index) => ({ ...base, reportId: `d-${index}`, assemblyId, testedOn: '2024-05-02', testedAt: `2024-05-02T1${index}:00:00Z`, input: dcReadings })),
      { ...base, reportId: 'b-1', assemblyId: 'asm-7', testedOn: '2024-04-01', installedOn: '2024-04-10', input: rpReadings },
      ...[0, 10, 20, 30, 40, 50].map((minute, index) => ({ ...base, testerId: 't-2', reportId: `q-${index}`, assemblyId: `asm-q${index}`, testedOn: '2024-06-03', testedAt: `2024-06-03T10:${String(minute).padStart(2, '0')}:00Z`, input: { ...dcReadings, check1Differential: 2 + index / 10 } })),
    ];
    const signals = detectSuspiciousSignalsInBatch(reports);
    const codesOf = (reportId: string) => (signals.get(reportId) ?? []).map((signal) => signal.code);
    expect(codesOf('p-1')).toEqual([]);
    expect(codesOf('p-2')).toEqual(['same_as_previous_test']);
    for (let index = 0; index < 5; index++) expect(codesOf(`d-${index}`)).toEqual(['identical_readings_across_assemblies']);
    expect(codesOf('b-1')).toEqual(['test_before_installation']);
    for (let index = 0; index < 6; index++) expect(codesOf(`q-${index}`)).toEqual(['many_tests_in_short_time']);
    expect([...signals.keys()].sort()).toEqual(['b-1', 'd-0', 'd-1', 'd-2', 'd-3', 'd-4', 'p-2', 'q-0', 'q-1', 'q-2', 'q-3', 'q-4', 'q-5']);
  });
});
