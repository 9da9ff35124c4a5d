import { describe, expect, it, test } from 'vitest';
import {
  bufferRuleSet,
  defaultRuleSet,
  labelOfRule,
  publishedRuleSets,
  ruleIds,
  ruleLabels,
  ruleSetById,
  structuredCloneRuleSet,
  validateRuleSet,
  type RuleSet,
} from '@/lib/rules';

function localEdition(change: (ruleSet: RuleSet) => void): RuleSet {
  const ruleSet: RuleSet = { ...structuredCloneRuleSet(defaultRuleSet), edition: 'quillmere-valley-2025', label: 'Quillmere Valley Water District local edition', basedOn: 'published-current' };
  change(ruleSet);
  return ruleSet;
}

describe('published editions', () => {
  it('hold the published minimums with their sources', () => {
    // EPA Cross-Connection Control Manual (EPA 816-R-03-002, 2003), ch. 5, Fig. 39: relief ≥ 2.0; Fig. 39 step 1: check #1 ≥ 5.0.
    expect(defaultRuleSet.rp).toEqual({ reliefMin: 2.0, check1Min: 5.0, check1MustExceedRelief: true, bufferMin: null, check2FlowMin: null });
    // EPA 2003, Fig. 41; NEWWA field test procedures (2010): DC checks ≥ 1.0.
    expect(defaultRuleSet.dc).toEqual({ check1Min: 1.0, check2Min: 1.0 });
    // City PVB/SVB test form; public SVB one-hose procedure: air inlet and check ≥ 1.0.
    expect(defaultRuleSet.pvb).toEqual({ airInletMin: 1.0, checkMin: 1.0 });
    expect(defaultRuleSet.svb).toEqual({ airInletMin: 1.0, checkMin: 1.0 });
    // WAC 246-290-010; Connecticut Regs. §19-13-B38a: 2 × d, ≥ 1 in.; side wall 3 × d, ≥ 1.5 in.
    expect(defaultRuleSet.airGap).toEqual({ diameterFactor: 2, minInches: 1, sideWallFactor: 3, sideWallMinInches: 1.5 });
    // Trade article: gauges read 0–15 psid; kit verified at least every 12 months (city policy, OAR 333-061-0070(6)).
    expect(defaultRuleSet.gauge.rangeMaxPsid).toBe(15);
    expect(defaultRuleSet.kit.verificationMaxMonths).toBe(12);
    expect(defaultRuleSet.sources['rp.relief.min']).toMatch(/EPA 816-R-03-002, 2003\), ch\. 5, Fig\. 39/);
    expect(defaultRuleSet.sources['ag.gap.min']).toMatch(/WAC 246-290-010/);
  });

  it('include the 3.0 psid buffer edition', () => {
    expect(bufferRuleSet.rp.bufferMin).toBe(3.0);
    expect(bufferRuleSet.rp.check1MustExceedRelief).toBe(true);
    expect(ruleSetById('published-buffer-3')).toBe(bufferRuleSet);
    expect(ruleSetById('published-current')).toBe(defaultRuleSet);
    expect(ruleSetById('no-such-edition')).toBeUndefined();
  });

  it('are valid, frozen, JSON-serialisable and have a source and a label for every rule', () => {
    for (const ruleSet of publishedRuleSets) {
      expect(validateRuleSet(ruleSet)).toEqual([]);
      expect(Object.isFrozen(ruleSet.rp)).toBe(true);
      expect(JSON.parse(JSON.stringify(ruleSet))).toEqual(ruleSet);
      for (const rule of ruleIds) expect(ruleSet.sources[rule]).toBeTruthy();
    }
    expect(new Set(publishedRuleSets.map((ruleSet) => ruleSet.edition)).size).toBe(publishedRuleSets.length);
    for (const rule of ruleIds) expect(ruleLabels[rule]).toBeTruthy();
    expect(labelOfRule('rp.relief.min')).toBe('Relief valve opening point');
    expect(labelOfRule('future.rule')).toBe('future.rule');
  });
});

describe('validateRuleSet', () => {
  it('accepts a stricter local edition without any variance', () => {
    const stricter = localEdition((ruleSet) => {
      ruleSet.rp.check1Min = 5.5;
      ruleSet.rp.bufferMin = 3.0;
      ruleSet.dc.check1Min = 1.5;
      ruleSet.kit.verificationMaxMonths = 6;
    });
    expect(validateRuleSet(stricter)).toEqual([]);
  });

  it('refuses a lower minimum without a variance, and accepts it with the reason', () => {
    const lower = localEdition((ruleSet) => {
      ruleSet.dc.check1Min = 0.8;
    });
    const problems = validateRuleSet(lower);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ path: 'dc.check1Min', code: 'less_strict_without_variance' });
    expect(problems[0]!.message).toMatch(/local variance/);

    lower.variances = [{ path: 'dc.check1Min', reason: 'State-approved variance for legacy fire-line assemblies, letter of 2024-03-02' }];
    expect(validateRuleSet(lower)).toEqual([]);
  });

  test.each([
    ['switching check #1 > relief off', (ruleSet: RuleSet) => void (ruleSet.rp.check1MustExceedRelief = false), 'rp.check1MustExceedRelief'],
    ['a longer kit interval', (ruleSet: RuleSet) => void (ruleSet.kit.verificationMaxMonths = 24), 'kit.verificationMaxMonths'],
    ['a wider gauge range', (ruleSet: RuleSet) => void (ruleSet.gauge.rangeMaxPsid = 30), 'gauge.rangeMaxPsid'],
    ['a smaller air gap factor', (ruleSet: RuleSet) => void (ruleSet.airGap.diameterFactor = 1.5), 'airGap.diameterFactor'],
    ['a lower relief minimum', (ruleSet: RuleSet) => void (ruleSet.rp.reliefMin = 1.5), 'rp.reliefMin'],
  ])('treats %s as less strict', (_label, change, path) => {
    expect(validateRuleSet(localEdition(change)).map((problem) => problem.path)).toEqual([path]);
  });

  it('treats switching the buffer off, or lowering it, as less strict against the buffer edition', () => {
    const base = bufferRuleSet;
    const off: RuleSet = { ...structuredCloneRuleSet(base), edition: 'thistlecombe', basedOn: base.edition };
    off.rp.bufferMin = null;
    expect(validateRuleSet(off, base).map((problem) => problem.path)).toEqual(['rp.bufferMin']);
    off.rp.bufferMin = 2.5;
    expect(validateRuleSet(off, base).map((problem) => problem.path)).toEqual(['rp.bufferMin']);
    off.rp.bufferMin = 3.5;
    expect(validateRuleSet(off, base)).toEqual([]);
  });

  it('refuses a variance without a reason or on an unknown value', () => {
    const lower = localEdition((ruleSet) => {
      ruleSet.pvb.checkMin = 0.5;
      ruleSet.variances = [{ path: 'pvb.checkMin', reason: '   ' }];
    });
    expect(validateRuleSet(lower).map((problem) => problem.code).sort()).toEqual(['invalid_variance', 'less_strict_without_variance']);
    const unknown = localEdition((ruleSet) => {
      ruleSet.variances = [{ path: 'pvb.colour' as never, reason: 'because' }];
    });
    expect(validateRuleSet(unknown)[0]).toMatchObject({ code: 'invalid_variance', path: 'variances.0.path' });
  });

  it('refuses malformed values, missing sources and unreachable minimums', () => {
    const broken = localEdition((ruleSet) => {
      (ruleSet.rp as { check1Min: unknown }).check1Min = 'five';
      ruleSet.dc.check2Min = -1;
      ruleSet.svb.airInletMin = 16;
      ruleSet.sources['dc.check1.min'] = '';
      ruleSet.edition = '';
    });
    const paths = validateRuleSet(broken).map((problem) => problem.path);
    expect(paths).toEqual(expect.arrayContaining(['edition', 'rp.check1Min', 'dc.check2Min', 'svb.airInletMin', 'sources.dc.check1.min']));
    expect(validateRuleSet(null)).toEqual([{ path: '', code: 'invalid', message: 'A rule set must be an object.' }]);
    expect(validateRuleSet(localEdition((ruleSet) => void (ruleSet.rp.bufferMin = 14))).map((problem) => problem.path)).toContain('rp.bufferMin');
  });

  it('refuses a local edition that reuses a published id with other values', () => {
    const copy = { ...structuredCloneRuleSet(defaultRuleSet) };
    expect(validateRuleSet(copy)).toEqual([]);
    copy.dc.check1Min = 1.2;
    expect(validateRuleSet(copy).map((problem) => problem.code)).toEqual(['edition_taken']);
  });
});
