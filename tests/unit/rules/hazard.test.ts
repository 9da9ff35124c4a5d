import { describe, expect, it, test } from 'vitest';
import { allowedKinds, assemblyKinds, protectionWarnings, type AssemblyKind, type Hazard } from '@/lib/rules';

describe('allowedKinds', () => {
  // Washington WAC 246-290-490(4)(b): high → AG, RP, RPDA only; low → also DC, DCDA; severe → AG, or RP/RPDA with an
  // in-plant air gap. Texas 30 TAC §344.50(b)(3)–(4): PVB/SVB never where backpressure is possible.
  test.each([
    ['severe', false, ['AG', 'RP', 'RPDA']],
    ['severe', true, ['AG', 'RP', 'RPDA']],
    ['high', false, ['AG', 'RP', 'RPDA']],
    ['high', true, ['AG', 'RP', 'RPDA']],
    ['low', false, ['AG', 'RP', 'RPDA', 'DC', 'DCDA', 'PVB', 'SVB']],
    ['low', true, ['AG', 'RP', 'RPDA', 'DC', 'DCDA']],
  ] as const)('%s hazard, backpressure possible: %s', (hazard, backpressurePossible, kinds) => {
    expect(allowedKinds(hazard, backpressurePossible)).toEqual(kinds);
  });
});

describe('protectionWarnings', () => {
  // The full table: which kind gets a warning at which hazard (backpressure possible = false unless said).
  const expectedWarningCount: Record<Hazard, Record<AssemblyKind, number>> = {
    severe: { AG: 0, RP: 1, RPDA: 1, DC: 1, DCDA: 1, PVB: 1, SVB: 1 },
    high: { AG: 0, RP: 0, RPDA: 0, DC: 1, DCDA: 1, PVB: 1, SVB: 1 },
    low: { AG: 0, RP: 0, RPDA: 0, DC: 0, DCDA: 0, PVB: 0, SVB: 0 },
  };
  test.each((['severe', 'high', 'low'] as const).flatMap((hazard) => assemblyKinds.map((kind) => [hazard, kind] as const)))('%s hazard with %s', (hazard, kind) => {
    expect(protectionWarnings({ hazard, kind, backpressurePossible: false })).toHaveLength(expectedWarningCount[hazard][kind]);
  });

  it('explains a DC on a high hazard in one sentence with its source', () => {
    expect(protectionWarnings({ hazard: 'high', kind: 'DC', backpressurePossible: false })).toEqual([
      'A DC does not protect a high health hazard at the service connection: it needs an air gap, an RP or an RPDA (Washington WAC 246-290-490(4)(b)).',
    ]);
  });

  it('asks to confirm the in-plant air gap for an RP on a severe hazard', () => {
    expect(protectionWarnings({ hazard: 'severe', kind: 'RP' })[0]).toMatch(/confirm the in-plant air gap/);
    expect(protectionWarnings({ hazard: 'severe', kind: 'RPDA', inPlantAirGapConfirmed: true })).toEqual([]);
  });

  it('never accepts a vacuum breaker where backpressure is possible, and asks when it is not recorded', () => {
    expect(protectionWarnings({ hazard: 'low', kind: 'PVB', backpressurePossible: true })).toEqual([
      'A PVB protects against backsiphonage only and must never be used where backpressure is possible (Texas 30 TAC §344.50(b)(3)–(4)).',
    ]);
    expect(protectionWarnings({ hazard: 'low', kind: 'SVB' })[0]).toMatch(/^Confirm that no backpressure is possible/);
    expect(protectionWarnings({ hazard: 'high', kind: 'SVB', backpressurePossible: true })).toHaveLength(2);
  });
});
