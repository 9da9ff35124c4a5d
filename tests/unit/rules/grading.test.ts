import { describe, expect, it, test } from 'vitest';
import {
  ReadingValidationError,
  RulesInputError,
  bufferRuleSet,
  check2FlowRuleSet,
  defaultRuleSet,
  gradeFieldTest,
  gradeReport,
  psidToKpa,
  requiredFields,
  optionalFields,
  ruleLabels,
  structuredCloneRuleSet,
  assemblyKinds,
  type FieldTestInput,
  type Grade,
  type RuleSet,
} from '@/lib/rules';

const rpFlags = { check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true } as const;
const dcFlags = { check1ClosedTight: true, shutoff2Tight: true } as const;
const vbFlags = { airInletFullyOpen: true, checkClosedTight: true } as const;

const rp = (readings: Partial<FieldTestInput> = {}): FieldTestInput => ({ kind: 'RP', reliefValveOpeningPoint: 2.5, check1Differential: 6.0, ...rpFlags, ...readings });
const dc = (readings: Partial<FieldTestInput> = {}): FieldTestInput => ({ kind: 'DC', check1Differential: 1.5, check2Differential: 1.5, ...dcFlags, ...readings });
const vb = (kind: 'PVB' | 'SVB', readings: Partial<FieldTestInput> = {}): FieldTestInput => ({ kind, airInletOpeningPoint: 1.5, checkDifferential: 1.5, ...vbFlags, ...readings });
const ag = (readings: Partial<FieldTestInput> = {}): FieldTestInput => ({ kind: 'AG', supplyPipeDiameterInches: 1, airGapInches: 3, nearSideWall: false, ...readings });

function findingOf(grade: Grade, rule: string) {
  const finding = grade.findings.find((candidate) => candidate.rule === rule);
  if (!finding) throw new Error(`no finding ${rule} in ${JSON.stringify(grade.findings.map((f) => f.rule))}`);
  return finding;
}

describe('RP and RPDA boundaries (published minimums)', () => {
  // EPA Cross-Connection Control Manual (EPA 816-R-03-002, 2003), ch. 5, Fig. 39: relief valve opening point ≥ 2.0 psid.
  test.each([
    ['RP relief at 2.0 passes', 'RP', 2.0, true],
    ['RP relief at 1.9 fails', 'RP', 1.9, false],
    ['RP relief at 1.99 fails', 'RP', 1.99, false],
    ['RPDA relief at 2.0 passes', 'RPDA', 2.0, true],
    ['RPDA relief at 1.9 fails', 'RPDA', 1.9, false],
  ] as const)('%s', (_label, kind, relief, passed) => {
    const grade = gradeFieldTest(rp({ kind, reliefValveOpeningPoint: relief }));
    expect(findingOf(grade, 'rp.relief.min').passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  it('fails a relief valve that did not open', () => {
    // EPA 2003, ch. 5, Fig. 39: did not open = fail.
    const grade = gradeFieldTest(rp({ reliefValveOpeningPoint: null }));
    expect(grade.outcome).toBe('fail');
    expect(findingOf(grade, 'rp.relief.min')).toMatchObject({ passed: false, observed: null });
    expect(grade.findings.some((finding) => finding.rule === 'rp.check1.exceedsRelief')).toBe(false);
  });

  // EPA 2003, Fig. 39, step 1: check #1 differential ≥ 5.0 psid.
  test.each([
    ['RP check #1 at 5.0 passes', 'RP', 5.0, true],
    ['RP check #1 at 4.9 fails', 'RP', 4.9, false],
    ['RPDA check #1 at 5.0 passes', 'RPDA', 5.0, true],
    ['RPDA check #1 at 4.9 fails', 'RPDA', 4.9, false],
  ] as const)('%s', (_label, kind, check1, passed) => {
    const grade = gradeFieldTest(rp({ kind, reliefValveOpeningPoint: 2.0, check1Differential: check1 }));
    expect(findingOf(grade, 'rp.check1.min').passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  // USC Manual 10th ed. criteria via a public summary; Washington State Dept. of Health transition notice (2012):
  // check #1 must be GREATER than the relief valve opening point.
  test.each([
    ['check #1 6.0 above relief 5.9 passes', 5.9, 6.0, true],
    ['check #1 6.0 equal to relief 6.0 fails', 6.0, 6.0, false],
    ['check #1 6.0 below relief 6.5 fails', 6.5, 6.0, false],
  ])('%s', (_label, relief, check1, passed) => {
    const grade = gradeFieldTest(rp({ reliefValveOpeningPoint: relief, check1Differential: check1 }));
    expect(findingOf(grade, 'rp.check1.exceedsRelief').passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  it('can switch the check #1 > relief rule off in a local edition', () => {
    const local: RuleSet = { ...structuredCloneRuleSet(defaultRuleSet), edition: 'thistlecombe-older', basedOn: 'published-current' };
    local.rp.check1MustExceedRelief = false;
    const grade = gradeFieldTest(rp({ reliefValveOpeningPoint: 6.0, check1Differential: 6.0 }), local);
    expect(grade.outcome).toBe('pass');
    expect(grade.findings.some((finding) => finding.rule === 'rp.check1.exceedsRelief')).toBe(false);
  });

  // USC Manual 9th ed. via a public summary; city and provincial RP forms: check #1 − relief ≥ 3.0 psid (buffer edition only).
  test.each([
    ['buffer 3.0 (5.0 − 2.0) passes', 2.0, 5.0, true],
    ['buffer 2.9 (5.0 − 2.1) fails', 2.1, 5.0, false],
    ['buffer 3.0 with float noise (5.3 − 2.3) passes', 2.3, 5.3, true],
    ['buffer 3.6 (6.1 − 2.5) passes', 2.5, 6.1, true],
  ])('%s', (_label, relief, check1, passed) => {
    const grade = gradeFieldTest(rp({ reliefValveOpeningPoint: relief, check1Differential: check1 }), bufferRuleSet);
    expect(findingOf(grade, 'rp.buffer.min').passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
    expect(grade.edition).toBe('published-buffer-3');
  });

  it('records the buffer margin without float noise', () => {
    expect(findingOf(gradeFieldTest(rp({ reliefValveOpeningPoint: 2.3, check1Differential: 5.3 }), bufferRuleSet), 'rp.buffer.min').observed).toBe(3);
  });

  it('leaves the buffer rule out of the default edition', () => {
    const grade = gradeFieldTest(rp({ reliefValveOpeningPoint: 2.5, check1Differential: 5.0 }));
    expect(grade.outcome).toBe('pass');
    expect(grade.findings.some((finding) => finding.rule === 'rp.buffer.min')).toBe(false);
  });

  it('fails check #2 that did not hold against backpressure', () => {
    // EPA 2003, Fig. 40: check #2 closed tight against backpressure.
    const grade = gradeFieldTest(rp({ check2ClosedTight: false }));
    expect(grade.outcome).toBe('fail');
    expect(findingOf(grade, 'rp.check2.tight')).toMatchObject({ passed: false, observed: false });
  });

  it('fails check #1 that did not close tight', () => {
    // Common practice: RP test forms record check #1 closed tight [M].
    expect(findingOf(gradeFieldTest(rp({ check1ClosedTight: false })), 'rp.check1.tight').passed).toBe(false);
  });

  // A city RP test form; USC "Cross Talk" (1994), optional: check #2 in the direction of flow ≥ 1.0 psid.
  test.each([
    ['check #2 flow at 1.0 passes', 1.0, 'pass'],
    ['check #2 flow at 0.9 fails', 0.9, 'fail'],
    ['check #2 flow not recorded is incomplete', undefined, 'incomplete'],
  ] as const)('%s where the edition asks for it', (_label, check2, outcome) => {
    const grade = gradeFieldTest(rp({ check2Differential: check2 }), check2FlowRuleSet);
    expect(grade.outcome).toBe(outcome);
    if (outcome === 'incomplete') expect(grade.missing).toEqual(['check2Differential']);
  });

  it('ignores an RP check #2 differential when the edition does not ask for it', () => {
    const grade = gradeFieldTest(rp({ check2Differential: 0.2 }));
    expect(grade.outcome).toBe('pass');
    expect(grade.findings.some((finding) => finding.rule === 'rp.check2.flow.min')).toBe(false);
  });

  it('fails a leaking No. 2 shutoff: no-flow was not reached, so the readings are not valid', () => {
    // EPA 2003: No. 2 shutoff tight; if it leaks the readings are not valid.
    const grade = gradeFieldTest(rp({ shutoff2Tight: false }));
    expect(grade.outcome).toBe('fail');
    const finding = findingOf(grade, 'rp.shutoff2.tight');
    expect(finding).toMatchObject({ passed: false, observed: false });
    expect(finding.required).toMatch(/not valid/);
    expect(finding.source).toMatch(/EPA 816-R-03-002/);
  });
});

describe('DC and DCDA boundaries', () => {
  // EPA 2003, Fig. 41; New England Water Works Assn. field test procedures (2010): each check ≥ 1.0 psid.
  test.each([
    ['DC check #1 at 1.0 passes', 'DC', 'check1Differential', 'dc.check1.min', 1.0, true],
    ['DC check #1 at 0.9 fails', 'DC', 'check1Differential', 'dc.check1.min', 0.9, false],
    ['DC check #2 at 1.0 passes', 'DC', 'check2Differential', 'dc.check2.min', 1.0, true],
    ['DC check #2 at 0.9 fails', 'DC', 'check2Differential', 'dc.check2.min', 0.9, false],
    ['DCDA check #1 at 1.0 passes', 'DCDA', 'check1Differential', 'dc.check1.min', 1.0, true],
    ['DCDA check #1 at 0.9 fails', 'DCDA', 'check1Differential', 'dc.check1.min', 0.9, false],
    ['DCDA check #2 at 1.0 passes', 'DCDA', 'check2Differential', 'dc.check2.min', 1.0, true],
    ['DCDA check #2 at 0.9 fails', 'DCDA', 'check2Differential', 'dc.check2.min', 0.9, false],
  ] as const)('%s', (_label, kind, field, rule, value, passed) => {
    const grade = gradeFieldTest(dc({ kind, [field]: value }));
    expect(findingOf(grade, rule).passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  it('fails a leaking No. 2 shutoff', () => {
    // EPA 2003: No. 2 shutoff tight.
    const grade = gradeFieldTest(dc({ shutoff2Tight: false }));
    expect(grade.outcome).toBe('fail');
    expect(findingOf(grade, 'dc.shutoff2.tight').required).toMatch(/not valid/);
  });

  it('records check #2 closed tight only when given', () => {
    // Common practice: forms record whether each check closed tight [M].
    expect(gradeFieldTest(dc()).findings.some((finding) => finding.rule === 'dc.check2.tight')).toBe(false);
    expect(gradeFieldTest(dc()).missing).toEqual([]);
    expect(findingOf(gradeFieldTest(dc({ check2ClosedTight: true })), 'dc.check2.tight').passed).toBe(true);
    expect(gradeFieldTest(dc({ check2ClosedTight: false })).outcome).toBe('fail');
    expect(gradeFieldTest(dc({ check1ClosedTight: false })).outcome).toBe('fail');
  });
});

describe('PVB and SVB boundaries', () => {
  // City PVB/SVB test form [S]; public SVB one-hose procedure [S]: air inlet ≥ 1.0 psid, opened fully, check ≥ 1.0 psid.
  test.each([
    ['PVB air inlet at 1.0 passes', 'PVB', 'airInletOpeningPoint', 'pvb.airInlet.min', 1.0, true],
    ['PVB air inlet at 0.9 fails', 'PVB', 'airInletOpeningPoint', 'pvb.airInlet.min', 0.9, false],
    ['PVB check at 1.0 passes', 'PVB', 'checkDifferential', 'pvb.check.min', 1.0, true],
    ['PVB check at 0.9 fails', 'PVB', 'checkDifferential', 'pvb.check.min', 0.9, false],
    ['SVB air inlet at 1.0 passes', 'SVB', 'airInletOpeningPoint', 'svb.airInlet.min', 1.0, true],
    ['SVB air inlet at 0.9 fails', 'SVB', 'airInletOpeningPoint', 'svb.airInlet.min', 0.9, false],
    ['SVB check at 1.0 passes', 'SVB', 'checkDifferential', 'svb.check.min', 1.0, true],
    ['SVB check at 0.9 fails', 'SVB', 'checkDifferential', 'svb.check.min', 0.9, false],
  ] as const)('%s', (_label, kind, field, rule, value, passed) => {
    const grade = gradeFieldTest(vb(kind, { [field]: value }));
    expect(findingOf(grade, rule).passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  test.each(['PVB', 'SVB'] as const)('%s: an air inlet that did not open, or did not open fully, fails', (kind) => {
    // City PVB/SVB test form [S]: did not open = fail; must open fully.
    const prefix = kind.toLowerCase();
    const notOpened = gradeFieldTest(vb(kind, { airInletOpeningPoint: null, airInletFullyOpen: undefined }));
    expect(notOpened.outcome).toBe('fail');
    expect(findingOf(notOpened, `${prefix}.airInlet.min`).observed).toBeNull();
    expect(notOpened.missing).toEqual([]);
    const notFully = gradeFieldTest(vb(kind, { airInletFullyOpen: false }));
    expect(notFully.outcome).toBe('fail');
    expect(findingOf(notFully, `${prefix}.airInlet.fullyOpen`).passed).toBe(false);
    expect(gradeFieldTest(vb(kind, { checkClosedTight: false })).outcome).toBe('fail');
  });
});

describe('air gap boundaries', () => {
  // Washington WAC 246-290-010 "approved air gap"; Connecticut Regs. §19-13-B38a: ≥ 2 × supply pipe diameter, never < 1 in.
  // WAC 246-290-010: with a side wall near the opening ≥ 3 × diameter, never < 1.5 in.
  test.each([
    ['2 × 1 in. pipe: 2.0 in. passes', 1, false, 2.0, 'ag.gap.min', true],
    ['2 × 1 in. pipe: 1.9 in. fails', 1, false, 1.9, 'ag.gap.min', false],
    ['1 in. floor (0.25 in. pipe): 1.0 in. passes', 0.25, false, 1.0, 'ag.gap.min', true],
    ['1 in. floor (0.25 in. pipe): 0.9 in. fails', 0.25, false, 0.9, 'ag.gap.min', false],
    ['side wall 3 × 1 in. pipe: 3.0 in. passes', 1, true, 3.0, 'ag.gap.sideWall.min', true],
    ['side wall 3 × 1 in. pipe: 2.9 in. fails', 1, true, 2.9, 'ag.gap.sideWall.min', false],
    ['side wall 1.5 in. floor (0.25 in. pipe): 1.5 in. passes', 0.25, true, 1.5, 'ag.gap.sideWall.min', true],
    ['side wall 1.5 in. floor (0.25 in. pipe): 1.4 in. fails', 0.25, true, 1.4, 'ag.gap.sideWall.min', false],
    ['float-noisy 2 × 0.7 in. pipe: 1.4 in. passes', 0.7, false, 1.4, 'ag.gap.min', true],
  ])('%s', (_label, diameter, nearSideWall, gap, rule, passed) => {
    const grade = gradeFieldTest(ag({ supplyPipeDiameterInches: diameter, nearSideWall, airGapInches: gap }));
    expect(grade.findings).toHaveLength(1);
    expect(findingOf(grade, rule).passed).toBe(passed);
    expect(grade.outcome).toBe(passed ? 'pass' : 'fail');
  });

  it('has no 15 limit on inches but refuses negative or non-numeric values', () => {
    expect(gradeFieldTest(ag({ supplyPipeDiameterInches: 12, airGapInches: 30 })).outcome).toBe('pass');
    expect(() => gradeFieldTest(ag({ airGapInches: -1 }))).toThrow(ReadingValidationError);
    expect(() => gradeFieldTest(ag({ airGapInches: Number.NaN }))).toThrow(ReadingValidationError);
    expect(() => gradeFieldTest(ag({ supplyPipeDiameterInches: 0 }))).toThrow(/greater than zero/);
  });
});

describe('worked cases (default rules)', () => {
  // The table lists the deciding readings; the closed-tight and shutoff entries the form always collects are filled
  // in as "tight" unless the case says otherwise.
  test.each([
    ['1: RP relief 2.5, check #1 6.0, check #2 tight → pass', rp({ reliefValveOpeningPoint: 2.5, check1Differential: 6.0 }), 'pass', null],
    ['2: RP relief 1.8, check #1 6.5 → fail on relief ≥ 2.0', rp({ reliefValveOpeningPoint: 1.8, check1Differential: 6.5 }), 'fail', 'rp.relief.min'],
    ['3: RP relief 2.0, check #1 4.9 → fail on check #1 ≥ 5.0', rp({ reliefValveOpeningPoint: 2.0, check1Differential: 4.9 }), 'fail', 'rp.check1.min'],
    ['4: RP relief 2.4, check #1 6.0, check #2 leaked → fail', rp({ reliefValveOpeningPoint: 2.4, check1Differential: 6.0, check2ClosedTight: false }), 'fail', 'rp.check2.tight'],
    ['5: DC check #1 1.4, check #2 0.8 → fail', dc({ check1Differential: 1.4, check2Differential: 0.8 }), 'fail', 'dc.check2.min'],
    ['6: DC check #1 1.0, check #2 2.3 → pass (inclusive)', dc({ check1Differential: 1.0, check2Differential: 2.3 }), 'pass', null],
    ['7: PVB air inlet 1.2 fully open, check 1.5 → pass', vb('PVB', { airInletOpeningPoint: 1.2, checkDifferential: 1.5 }), 'pass', null],
    ['8: PVB air inlet 0.7, check 2.0 → fail', { kind: 'PVB', airInletOpeningPoint: 0.7, checkDifferential: 2.0 } satisfies FieldTestInput, 'fail', 'pvb.airInlet.min'],
    ['9: SVB check 1.1, air inlet 1.3 not fully open → fail', vb('SVB', { checkDifferential: 1.1, airInletOpeningPoint: 1.3, airInletFullyOpen: false }), 'fail', 'svb.airInlet.fullyOpen'],
  ])('case %s', (_label, input, outcome, decidingRule) => {
    const grade = gradeFieldTest(input);
    expect(grade.outcome).toBe(outcome);
    const failedRules = grade.findings.filter((finding) => !finding.passed).map((finding) => finding.rule);
    expect(failedRules).toEqual(decidingRule === null ? [] : [decidingRule]);
  });

  it('case 3: relief at exactly 2.0 passes its own rule', () => {
    expect(findingOf(gradeFieldTest(rp({ reliefValveOpeningPoint: 2.0, check1Differential: 4.9 })), 'rp.relief.min').passed).toBe(true);
  });

  it('case 6 without the shutoff entry is incomplete, not a pass', () => {
    const grade = gradeFieldTest({ kind: 'DC', check1Differential: 1.0, check2Differential: 2.3, check1ClosedTight: true });
    expect(grade.outcome).toBe('incomplete');
    expect(grade.missing).toEqual(['shutoff2Tight']);
  });

  it('case 8 fails even though the form is not finished: a failure is final', () => {
    const grade = gradeFieldTest({ kind: 'PVB', airInletOpeningPoint: 0.7, checkDifferential: 2.0 });
    expect(grade.missing).toEqual(['airInletFullyOpen', 'checkClosedTight']);
    expect(grade.outcome).toBe('fail');
  });
});

describe('findings', () => {
  it('has one finding for every rule that applied, in form order', () => {
    const everything: RuleSet = { ...structuredCloneRuleSet(bufferRuleSet), edition: 'all-rules', basedOn: 'published-buffer-3' };
    everything.rp.check2FlowMin = 1.0;
    expect(gradeFieldTest(rp({ check1Differential: 6.0, check2Differential: 1.2 }), everything).findings.map((finding) => finding.rule)).toEqual([
      'rp.relief.min',
      'rp.check1.min',
      'rp.check1.tight',
      'rp.check1.exceedsRelief',
      'rp.buffer.min',
      'rp.check2.tight',
      'rp.check2.flow.min',
      'rp.shutoff2.tight',
    ]);
    expect(gradeFieldTest(dc({ check2ClosedTight: true })).findings.map((finding) => finding.rule)).toEqual([
      'dc.check1.min',
      'dc.check1.tight',
      'dc.check2.min',
      'dc.check2.tight',
      'dc.shutoff2.tight',
    ]);
    expect(gradeFieldTest(vb('SVB')).findings.map((finding) => finding.rule)).toEqual(['svb.airInlet.min', 'svb.airInlet.fullyOpen', 'svb.check.min', 'svb.check.tight']);
  });

  it('carries observed, required and a named source on every finding, and a label for every rule', () => {
    const grades = [gradeFieldTest(rp(), bufferRuleSet), gradeFieldTest(dc({ check2ClosedTight: true })), gradeFieldTest(vb('PVB')), gradeFieldTest(vb('SVB')), gradeFieldTest(ag()), gradeFieldTest(ag({ nearSideWall: true }))];
    for (const finding of grades.flatMap((grade) => grade.findings)) {
      expect(finding.source.length).toBeGreaterThan(10);
      expect(finding.required).toBeTruthy();
      expect(finding.observed).not.toBeUndefined();
      expect(ruleLabels[finding.rule as keyof typeof ruleLabels]).toBeTruthy();
    }
  });

  it('shows the required value in the unit the readings were entered in', () => {
    expect(findingOf(gradeFieldTest(rp()), 'rp.check1.min').required).toBe('≥ 5.0 psid');
    const inKpa = gradeFieldTest(rp({ unit: 'kPa', reliefValveOpeningPoint: 17.2, check1Differential: 41.4 }));
    expect(inKpa.unit).toBe('kPa');
    expect(findingOf(inKpa, 'rp.check1.min').required).toBe('≥ 34.5 kPa (5.0 psid)');
    expect(findingOf(inKpa, 'rp.relief.min').required).toMatch(/^≥ 13\.8 kPa \(2\.0 psid\)/);
    expect(findingOf(inKpa, 'rp.check1.min').observed).toBe(41.4);
  });

  it('grades kPa readings after converting them exactly', () => {
    // A reading exactly at the minimum converted to kPa must still pass (a rounded kPa minimum would fail it).
    expect(gradeFieldTest(dc({ unit: 'kPa', check1Differential: psidToKpa(1.0), check2Differential: psidToKpa(1.0) })).outcome).toBe('pass');
    expect(gradeFieldTest(dc({ unit: 'kPa', check1Differential: 6.9, check2Differential: 6.9 })).outcome).toBe('pass');
    expect(gradeFieldTest(dc({ unit: 'kPa', check1Differential: 6.89, check2Differential: 6.9 })).outcome).toBe('fail');
    expect(gradeFieldTest(rp({ unit: 'kPa', reliefValveOpeningPoint: psidToKpa(2.0), check1Differential: psidToKpa(5.0) }), bufferRuleSet).outcome).toBe('pass');
  });
});

describe('missing readings', () => {
  const complete: Record<string, FieldTestInput> = {
    RP: rp(),
    RPDA: rp({ kind: 'RPDA' }),
    DC: dc(),
    DCDA: dc({ kind: 'DCDA' }),
    PVB: vb('PVB'),
    SVB: vb('SVB'),
    AG: ag(),
  };
  const cases = assemblyKinds.flatMap((kind) => requiredFields(kind).map((field) => [kind, field] as const));

  test.each(cases)('%s without %s is incomplete and lists it', (kind, field) => {
    const input = { ...complete[kind]! } as Record<string, unknown>;
    delete input[field];
    const grade = gradeFieldTest(input as unknown as FieldTestInput);
    expect(grade.outcome).toBe('incomplete');
    expect(grade.missing).toEqual([field]);
    expect(grade.findings.every((finding) => finding.passed)).toBe(true);
  });

  it('treats null as not recorded except where null means "did not open"', () => {
    const grade = gradeFieldTest({ ...dc(), check1Differential: null } as unknown as FieldTestInput);
    expect(grade.missing).toEqual(['check1Differential']);
  });

  it('grades an empty form as incomplete with every required field missing', () => {
    for (const kind of assemblyKinds) {
      const grade = gradeFieldTest({ kind });
      expect(grade.outcome).toBe('incomplete');
      expect(grade.findings).toEqual([]);
      expect(grade.missing).toEqual(requiredFields(kind));
    }
  });

  it('lists required and optional fields for the form', () => {
    expect(requiredFields('RP')).toEqual(['reliefValveOpeningPoint', 'check1Differential', 'check1ClosedTight', 'check2ClosedTight', 'shutoff2Tight']);
    expect(requiredFields('RPDA', check2FlowRuleSet)).toContain('check2Differential');
    expect(requiredFields('DCDA')).toEqual(['check1Differential', 'check1ClosedTight', 'check2Differential', 'shutoff2Tight']);
    expect(requiredFields('SVB')).toEqual(['airInletOpeningPoint', 'airInletFullyOpen', 'checkDifferential', 'checkClosedTight']);
    expect(requiredFields('AG')).toEqual(['supplyPipeDiameterInches', 'airGapInches', 'nearSideWall']);
    expect(optionalFields('DC')).toEqual(['check2ClosedTight']);
    expect(optionalFields('RP')).toEqual(['check2Differential']);
    expect(optionalFields('RP', check2FlowRuleSet)).toEqual([]);
  });
});

describe('readings that cannot be graded', () => {
  const differentialCases = [
    ['RP', 'reliefValveOpeningPoint'],
    ['RP', 'check1Differential'],
    ['RP', 'check2Differential'],
    ['DC', 'check1Differential'],
    ['DCDA', 'check2Differential'],
    ['PVB', 'airInletOpeningPoint'],
    ['SVB', 'checkDifferential'],
  ] as const;
  const base = (kind: string): FieldTestInput => (kind === 'RP' ? rp() : kind === 'DC' || kind === 'DCDA' ? dc({ kind: kind as 'DC' }) : vb(kind as 'PVB'));

  test.each(differentialCases.flatMap(([kind, field]) => [
    [kind, field, -0.1, /negative/],
    [kind, field, Number.NaN, /finite/],
    [kind, field, Number.POSITIVE_INFINITY, /finite/],
    [kind, field, 15.1, /range of 15\.0 psid/],
  ] as const))('%s %s = %s throws', (kind, field, value, message) => {
    let caught: unknown;
    try {
      gradeFieldTest({ ...base(kind), [field]: value });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(ReadingValidationError);
    expect(caught).toBeInstanceOf(Error);
    expect((caught as ReadingValidationError).field).toBe(field);
    expect((caught as Error).message).toMatch(message);
  });

  it('accepts the top of the gauge range in psid and in kPa, and refuses just above it', () => {
    expect(gradeFieldTest(dc({ check1Differential: 15, check2Differential: 15 })).outcome).toBe('pass');
    expect(gradeFieldTest(dc({ unit: 'kPa', check1Differential: psidToKpa(15), check2Differential: 103.42 })).outcome).toBe('pass');
    expect(() => gradeFieldTest(dc({ unit: 'kPa', check1Differential: 103.43 }))).toThrow(ReadingValidationError);
  });

  it('refuses values of the wrong type, an unknown unit or kind', () => {
    expect(() => gradeFieldTest({ ...rp(), check1Differential: '6.0' } as unknown as FieldTestInput)).toThrow(/must be a number/);
    expect(() => gradeFieldTest({ ...rp(), shutoff2Tight: 'yes' } as unknown as FieldTestInput)).toThrow(/true or false/);
    expect(() => gradeFieldTest({ ...rp(), unit: 'bar' } as unknown as FieldTestInput)).toThrow(ReadingValidationError);
    expect(() => gradeFieldTest({ kind: 'XX' } as unknown as FieldTestInput)).toThrow(/Unknown assembly kind/);
  });

  it('refuses a malformed rule set instead of grading against it', () => {
    const broken = { ...structuredCloneRuleSet(defaultRuleSet), edition: 'broken' };
    (broken.dc as { check1Min: unknown }).check1Min = 'one';
    expect(() => gradeFieldTest(dc(), broken)).toThrow(RulesInputError);
  });
});

describe('local editions', () => {
  it('grades against a stricter local edition', () => {
    const local: RuleSet = { ...structuredCloneRuleSet(defaultRuleSet), edition: 'quillmere-valley-2025', label: 'Quillmere Valley local minimums', basedOn: 'published-current' };
    local.rp.check1Min = 5.5;
    local.rp.bufferMin = 3.0;
    local.sources['rp.check1.min'] = 'Quillmere Valley Water District cross-connection rules §4.2 (stricter than EPA 2003, Fig. 39)';
    const input = rp({ reliefValveOpeningPoint: 2.5, check1Differential: 5.2 });
    expect(gradeFieldTest(input).outcome).toBe('pass');
    const grade = gradeFieldTest(input, local);
    expect(grade.outcome).toBe('fail');
    expect(grade.edition).toBe('quillmere-valley-2025');
    expect(findingOf(grade, 'rp.check1.min')).toMatchObject({ passed: false, required: '≥ 5.5 psid', source: expect.stringMatching(/Quillmere/) });
    expect(findingOf(grade, 'rp.buffer.min').passed).toBe(false);
  });

  it('grades against a rule set read back from JSON', () => {
    const stored = JSON.parse(JSON.stringify(bufferRuleSet)) as RuleSet;
    expect(gradeFieldTest(rp({ reliefValveOpeningPoint: 2.5, check1Differential: 5.0 }), stored).outcome).toBe('fail');
  });
});

describe('gradeReport', () => {
  it('takes the retest outcome after a repair', () => {
    const report = gradeReport({ initial: rp({ reliefValveOpeningPoint: 1.5 }), retest: rp({ reliefValveOpeningPoint: 2.6 }), ruleSet: defaultRuleSet });
    expect(report.initial.outcome).toBe('fail');
    expect(report.retest?.outcome).toBe('pass');
    expect(report).toMatchObject({ outcome: 'pass', passedAfterRepair: true });
  });

  it('uses the initial outcome without a retest', () => {
    expect(gradeReport({ initial: dc() })).toMatchObject({ outcome: 'pass', passedAfterRepair: false });
    expect(gradeReport({ initial: dc({ check2Differential: 0.5 }) })).toMatchObject({ outcome: 'fail', passedAfterRepair: false });
    expect(gradeReport({ initial: dc({ check2Differential: 0.5 }), retest: dc({ check2Differential: 0.6 }) })).toMatchObject({ outcome: 'fail', passedAfterRepair: false });
  });

  it('refuses a retest of another kind', () => {
    expect(() => gradeReport({ initial: dc(), retest: rp() })).toThrow(ReadingValidationError);
  });
});
