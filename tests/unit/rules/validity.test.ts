import { describe, expect, it, test } from 'vitest';
import { RulesInputError, checkReportValidity, isReportValid, type FieldTestInput, type ReportValidityInput } from '@/lib/rules';

const goodRp: FieldTestInput = { kind: 'RP', reliefValveOpeningPoint: 2.5, check1Differential: 6.0, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };

const valid: ReportValidityInput = {
  testDate: '2024-03-15',
  today: '2024-03-18',
  certificationExpiresOn: '2025-06-30',
  kitVerifiedOn: '2023-09-01',
  installedOn: '2019-04-02',
  input: goodRp,
  linePressurePsi: 68,
};

const codesOf = (params: Partial<ReportValidityInput>) => checkReportValidity({ ...valid, ...params }).map((issue) => `${issue.severity}:${issue.code}`);

describe('checkReportValidity', () => {
  it('finds nothing on a clean report', () => {
    expect(checkReportValidity(valid)).toEqual([]);
    expect(isReportValid(checkReportValidity(valid))).toBe(true);
  });

  // Worked case 10: kit verified 2023-03-01, test on 2024-03-15 → refused or flagged (kit verified within 12 months:
  // Texas city policy citing state practice [S]; Oregon OAR 333-061-0070(6) [P]).
  it('case 10: refuses a kit verified more than 12 months before the test, or flags it by program setting', () => {
    expect(codesOf({ kitVerifiedOn: '2023-03-01' })).toEqual(['error:kit_verification_expired']);
    expect(codesOf({ kitVerifiedOn: '2023-03-01', kitPolicy: 'flag' })).toEqual(['warning:kit_verification_expired']);
    expect(isReportValid(checkReportValidity({ ...valid, kitVerifiedOn: '2023-03-01', kitPolicy: 'flag' }))).toBe(true);
  });

  test.each([
    ['verified exactly 12 months before', '2023-03-15', []],
    ['verified 12 months and a day before', '2023-03-14', ['error:kit_verification_expired']],
    ['verified on the test day', '2024-03-15', []],
    ['verified after the test', '2024-03-16', ['error:kit_verified_after_test']],
  ])('kit %s', (_label, kitVerifiedOn, codes) => {
    expect(codesOf({ kitVerifiedOn })).toEqual(codes);
  });

  it('uses the calendar month for a leap-day verification', () => {
    expect(codesOf({ kitVerifiedOn: '2024-02-29', testDate: '2025-02-28', today: '2025-03-01' })).toEqual([]);
    expect(codesOf({ kitVerifiedOn: '2024-02-29', testDate: '2025-03-01', today: '2025-03-01' })).toEqual(['error:kit_verification_expired']);
  });

  it('reports a missing kit verification', () => {
    expect(codesOf({ kitVerifiedOn: null })).toEqual(['error:kit_verification_missing']);
  });

  test.each([
    ['expiring on the test day', '2024-03-15', []],
    ['expired the day before', '2024-03-14', ['error:certification_expired']],
    ['missing', null, ['error:certification_missing']],
  ])('certification %s', (_label, certificationExpiresOn, codes) => {
    // An expired certificate may not test (Utah R309-305-8).
    expect(codesOf({ certificationExpiresOn })).toEqual(codes);
  });

  it('refuses a certification issued after the test', () => {
    expect(codesOf({ certificationIssuedOn: '2024-03-20', today: '2024-03-25' })).toEqual(['error:certification_not_yet_valid']);
  });

  test.each([
    ['a test dated tomorrow', { testDate: '2024-03-19' }, ['error:test_date_in_future']],
    ['a test dated today', { testDate: '2024-03-18' }, []],
    ['a test before installation', { installedOn: '2024-03-16' }, ['error:test_before_installation']],
    ['a test on the installation day', { installedOn: '2024-03-15' }, []],
    ['a test after removal', { removedOn: '2024-03-01' }, ['error:test_after_removal']],
  ] as const)('dates: %s', (_label, params, codes) => {
    expect(codesOf(params)).toEqual(codes);
  });

  it('warns about a late filing after the 10-day default', () => {
    expect(codesOf({ submittedOn: '2024-03-25' })).toEqual([]);
    expect(codesOf({ submittedOn: '2024-03-26', today: '2024-03-26' })).toEqual(['warning:late_filing']);
    expect(codesOf({ submittedOn: '2024-03-26', today: '2024-03-26', reportDeadlineDays: 30 })).toEqual([]);
  });

  it('warns when an RP relief opening point is not below check #1 (the readings cannot both be right)', () => {
    expect(codesOf({ input: { ...goodRp, reliefValveOpeningPoint: 6.0 } })).toEqual(['warning:relief_not_below_check1']);
    expect(codesOf({ input: { ...goodRp, reliefValveOpeningPoint: 6.5 } })).toEqual(['warning:relief_not_below_check1']);
    expect(codesOf({ input: { ...goodRp, unit: 'kPa', reliefValveOpeningPoint: 41.4, check1Differential: 41.3 }, linePressurePsi: 70 })).toEqual(['warning:relief_not_below_check1']);
    expect(codesOf({ input: { ...goodRp, reliefValveOpeningPoint: 5.9 } })).toEqual([]);
  });

  it('warns when an air inlet is recorded as both not opening and opening fully', () => {
    expect(codesOf({ input: { kind: 'PVB', airInletOpeningPoint: null, airInletFullyOpen: true, checkDifferential: 1.5, checkClosedTight: true } })).toEqual(['warning:air_inlet_fully_open_without_opening']);
  });

  it('turns a reading the gauge cannot give into an error naming the field', () => {
    const issues = checkReportValidity({ ...valid, input: { ...goodRp, check1Differential: 16 } });
    expect(issues).toEqual([expect.objectContaining({ code: 'reading_invalid', severity: 'error', field: 'check1Differential' })]);
    const retestIssues = checkReportValidity({ ...valid, retest: { ...goodRp, reliefValveOpeningPoint: -1 } });
    expect(retestIssues).toEqual([expect.objectContaining({ code: 'reading_invalid', field: 'retest.reliefValveOpeningPoint' })]);
  });

  it('checks the retest is of the same kind', () => {
    expect(codesOf({ retest: { kind: 'DC', check1Differential: 2 } })).toEqual(['error:retest_kind_mismatch']);
  });

  test.each([
    ['missing', undefined, ['warning:line_pressure_missing']],
    ['equal to the highest differential', 6.0, ['warning:line_pressure_not_above_readings']],
    ['below the highest differential', 4, ['warning:line_pressure_not_above_readings']],
    ['just above', 6.1, []],
    ['negative', -5, ['error:line_pressure_invalid']],
  ])('line pressure %s', (_label, linePressurePsi, codes) => {
    expect(codesOf({ linePressurePsi })).toEqual(codes);
  });

  it('compares line pressure with the retest readings too, and needs none for an air gap', () => {
    expect(codesOf({ linePressurePsi: 7, retest: { ...goodRp, check1Differential: 7.5 } })).toEqual(['warning:line_pressure_not_above_readings']);
    expect(codesOf({ input: { kind: 'AG', supplyPipeDiameterInches: 1, airGapInches: 2, nearSideWall: false }, linePressurePsi: undefined })).toEqual([]);
  });

  it('gives each issue a plain message', () => {
    const [issue] = checkReportValidity({ ...valid, certificationExpiresOn: '2024-01-31' });
    expect(issue?.message).toBe("The tester's certification expired on 2024-01-31, before the test on 2024-03-15; an expired certificate may not test.");
  });

  it('refuses malformed dates and settings', () => {
    expect(() => checkReportValidity({ ...valid, testDate: '15/03/2024' })).toThrow(RulesInputError);
    expect(() => checkReportValidity({ ...valid, kitVerifiedOn: '2023-02-29' })).toThrow(/kitVerifiedOn/);
    expect(() => checkReportValidity({ ...valid, kitPolicy: 'ignore' as never })).toThrow(/kitPolicy/);
  });
});
