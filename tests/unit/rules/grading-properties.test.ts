import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  COMPARISON_EPSILON_PSID,
  bufferRuleSet,
  check2FlowRuleSet,
  defaultRuleSet,
  gradeFieldTest,
  psidToKpa,
  type FieldTestInput,
  type RuleSet,
} from '@/lib/rules';

const ruleSets: RuleSet[] = [defaultRuleSet, bufferRuleSet, check2FlowRuleSet];
const ruleSetArbitrary = fc.constantFrom(...ruleSets);

// Readings as a gauge gives them (tenths) and as arbitrary doubles, both within the 0–15 psid range.
const tenths = fc.integer({ min: 0, max: 150 }).map((value) => value / 10);
const anyReading = fc.double({ min: 0, max: 15, noNaN: true });
const reading = fc.oneof(tenths, anyReading);
const flag = fc.boolean();
const optional = <T>(arbitrary: fc.Arbitrary<T>) => fc.option(arbitrary, { nil: undefined });

const rpInput = fc.record({
  kind: fc.constantFrom('RP' as const, 'RPDA' as const),
  reliefValveOpeningPoint: optional(fc.option(reading, { nil: null })),
  check1Differential: optional(reading),
  check1ClosedTight: optional(flag),
  check2ClosedTight: optional(flag),
  check2Differential: optional(reading),
  shutoff2Tight: optional(flag),
});
const dcInput = fc.record({
  kind: fc.constantFrom('DC' as const, 'DCDA' as const),
  check1Differential: optional(reading),
  check1ClosedTight: optional(flag),
  check2Differential: optional(reading),
  check2ClosedTight: optional(flag),
  shutoff2Tight: optional(flag),
});
const vbInput = fc.record({
  kind: fc.constantFrom('PVB' as const, 'SVB' as const),
  airInletOpeningPoint: optional(fc.option(reading, { nil: null })),
  airInletFullyOpen: optional(flag),
  checkDifferential: optional(reading),
  checkClosedTight: optional(flag),
});
const agInput = fc.record({
  kind: fc.constant('AG' as const),
  supplyPipeDiameterInches: optional(fc.double({ min: 0.1, max: 24, noNaN: true })),
  airGapInches: optional(fc.double({ min: 0, max: 100, noNaN: true })),
  nearSideWall: optional(flag),
});
const anyInput: fc.Arbitrary<FieldTestInput> = fc.oneof(rpInput, dcInput, vbInput, agInput);

// Complete forms with readings near and above the minimums: most of them pass, so the
// "raising never fails" properties are exercised on many passing grades.
const nearMinimum = (minimum: number) => fc.oneof(fc.integer({ min: Math.round((minimum - 0.3) * 10), max: 150 }).map((value) => value / 10), fc.double({ min: minimum - 0.3, max: 15, noNaN: true }));
const mostlyTrue = fc.oneof({ weight: 9, arbitrary: fc.constant(true) }, { weight: 1, arbitrary: fc.constant(false) });
const completeRp = fc.record({
  kind: fc.constantFrom('RP' as const, 'RPDA' as const),
  reliefValveOpeningPoint: fc.oneof(nearMinimum(2).map((value) => Math.min(value, 7)), fc.constant(null)),
  check1Differential: nearMinimum(5),
  check1ClosedTight: mostlyTrue,
  check2ClosedTight: mostlyTrue,
  check2Differential: nearMinimum(1),
  shutoff2Tight: mostlyTrue,
});
const completeDc = fc.record({
  kind: fc.constantFrom('DC' as const, 'DCDA' as const),
  check1Differential: nearMinimum(1),
  check1ClosedTight: mostlyTrue,
  check2Differential: nearMinimum(1),
  check2ClosedTight: optional(mostlyTrue),
  shutoff2Tight: mostlyTrue,
});
const completeVb = fc.record({
  kind: fc.constantFrom('PVB' as const, 'SVB' as const),
  airInletOpeningPoint: nearMinimum(1),
  airInletFullyOpen: mostlyTrue,
  checkDifferential: nearMinimum(1),
  checkClosedTight: mostlyTrue,
});
const completeAg = fc.record({
  kind: fc.constant('AG' as const),
  supplyPipeDiameterInches: fc.constantFrom(0.25, 0.5, 0.75, 1, 1.5, 2, 4),
  airGapInches: fc.double({ min: 0, max: 15, noNaN: true }),
  nearSideWall: fc.boolean(),
});

/** How much a reading may rise without leaving the gauge's range. */
const raise = (value: number, fraction: number) => value + (15 - value) * fraction;

describe('grading properties', () => {
  it('never throws on well-typed readings within the gauge range, and always explains itself', () => {
    fc.assert(
      fc.property(fc.oneof(anyInput, completeRp, completeDc, completeVb, completeAg), ruleSetArbitrary, (input, ruleSet) => {
        const grade = gradeFieldTest(input, ruleSet);
        expect(['pass', 'fail', 'incomplete']).toContain(grade.outcome);
        if (grade.outcome === 'pass') expect(grade.missing).toEqual([]);
        expect(grade.outcome === 'fail').toBe(grade.findings.some((finding) => !finding.passed));
        if (grade.outcome === 'incomplete') expect(grade.missing.length).toBeGreaterThan(0);
      }),
      { numRuns: 3000 },
    );
  });

  it('gives the same outcome and findings for readings entered in kPa', () => {
    fc.assert(
      fc.property(fc.oneof(rpInput, dcInput, vbInput, completeRp, completeDc, completeVb), ruleSetArbitrary, (input, ruleSet) => {
        const inKpa: Record<string, unknown> = { ...input, unit: 'kPa' };
        for (const field of ['reliefValveOpeningPoint', 'check1Differential', 'check2Differential', 'airInletOpeningPoint', 'checkDifferential']) {
          const value = inKpa[field];
          if (typeof value === 'number') inKpa[field] = psidToKpa(value);
        }
        const psidGrade = gradeFieldTest(input, ruleSet);
        const kpaGrade = gradeFieldTest(inKpa as unknown as FieldTestInput, ruleSet);
        expect(kpaGrade.outcome).toBe(psidGrade.outcome);
        expect(kpaGrade.missing).toEqual(psidGrade.missing);
        expect(kpaGrade.findings.map((finding) => [finding.rule, finding.passed])).toEqual(psidGrade.findings.map((finding) => [finding.rule, finding.passed]));
      }),
      { numRuns: 3000 },
    );
  });

  it('never turns a pass into a fail when check #1, check #2, an air inlet or a check differential rises', () => {
    let passesSeen = 0;
    fc.assert(
      fc.property(fc.oneof(completeRp, completeDc, completeVb, rpInput, dcInput, vbInput), ruleSetArbitrary, fc.double({ min: 0, max: 1, noNaN: true }), (input, ruleSet, fraction) => {
        if (gradeFieldTest(input, ruleSet).outcome !== 'pass') return;
        passesSeen++;
        for (const field of ['check1Differential', 'check2Differential', 'airInletOpeningPoint', 'checkDifferential'] as const) {
          const value = input[field as keyof typeof input];
          if (typeof value !== 'number') continue;
          const raised = { ...input, [field]: raise(value, fraction) } as FieldTestInput;
          expect(gradeFieldTest(raised, ruleSet).outcome).toBe('pass');
        }
      }),
      { numRuns: 3000 },
    );
    expect(passesSeen).toBeGreaterThan(300);
  });

  it('never turns a pass into a fail when the relief point rises but stays below check #1 minus any buffer', () => {
    let passesSeen = 0;
    fc.assert(
      fc.property(completeRp, ruleSetArbitrary, fc.double({ min: 0, max: 1, noNaN: true }), (input, ruleSet, fraction) => {
        if (gradeFieldTest(input, ruleSet).outcome !== 'pass') return;
        passesSeen++;
        const relief = input.reliefValveOpeningPoint as number;
        const check1 = input.check1Differential;
        // Strictly below check #1 (it must be greater), and leaving the buffer when the edition has one.
        const ceiling = check1 - (ruleSet.rp.bufferMin ?? 0) - 2 * COMPARISON_EPSILON_PSID;
        if (ceiling <= relief) return;
        const raised = { ...input, reliefValveOpeningPoint: relief + (ceiling - relief) * fraction };
        expect(gradeFieldTest(raised, ruleSet).outcome).toBe('pass');
      }),
      { numRuns: 3000 },
    );
    expect(passesSeen).toBeGreaterThan(300);
  });

  it('can turn a pass into a fail when the relief point rises to check #1: the one reading that must stay below another', () => {
    const input: FieldTestInput = { kind: 'RP', reliefValveOpeningPoint: 2.5, check1Differential: 6.0, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };
    expect(gradeFieldTest(input).outcome).toBe('pass');
    expect(gradeFieldTest({ ...input, reliefValveOpeningPoint: 6.0 }).outcome).toBe('fail');
    expect(gradeFieldTest({ ...input, reliefValveOpeningPoint: 3.0 }, bufferRuleSet).outcome).toBe('pass');
    expect(gradeFieldTest({ ...input, reliefValveOpeningPoint: 3.1 }, bufferRuleSet).outcome).toBe('fail');
  });

  it('never turns a pass into a fail when the air gap grows', () => {
    fc.assert(
      fc.property(fc.oneof(completeAg, agInput), fc.double({ min: 0, max: 50, noNaN: true }), (input, extra) => {
        if (gradeFieldTest(input).outcome !== 'pass') return;
        expect(gradeFieldTest({ ...input, airGapInches: (input.airGapInches as number) + extra }).outcome).toBe('pass');
      }),
    );
  });

  it('never throws for any missing reading: an empty form of any kind is incomplete', () => {
    fc.assert(
      fc.property(anyInput, (input) => {
        const sparse = Object.fromEntries(Object.entries(input).filter(([key, value]) => key === 'kind' || value !== undefined));
        expect(() => gradeFieldTest(sparse as unknown as FieldTestInput)).not.toThrow();
      }),
    );
  });
});
