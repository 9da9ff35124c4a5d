import { describe, expect, it } from 'vitest';
import { RulesInputError, summarizeProgramYear, type SummaryAssembly, type SummaryReport } from '@/lib/rules';

// A small invented inventory of the Quillmere Valley Water District, checked by hand for 2024.
const assemblies: SummaryAssembly[] = [
  { id: 'A1', kind: 'RP', hazard: 'high', installedOn: '2019-04-02', removedOn: null },
  { id: 'A2', kind: 'RP', hazard: 'high', installedOn: '2020-06-01', removedOn: null },
  { id: 'A3', kind: 'DC', hazard: 'low', installedOn: '2018-01-01', removedOn: null },
  { id: 'A4', kind: 'DC', hazard: 'low', installedOn: '2018-01-01', removedOn: null },
  { id: 'A5', kind: 'PVB', hazard: 'low', installedOn: '2017-05-05', removedOn: null },
  { id: 'A6', kind: 'RP', hazard: 'high', installedOn: '2024-08-15', removedOn: null },
  { id: 'A7', kind: 'DC', hazard: 'low', installedOn: '2015-01-01', removedOn: '2024-07-01' },
  { id: 'A8', kind: 'RP', hazard: 'high', installedOn: '2025-02-01', removedOn: null },
  { id: 'A9', kind: 'RPDA', hazard: 'severe', installedOn: '2024-12-20', removedOn: null },
  { id: 'A10', kind: 'DC', hazard: 'low', installedOn: '2016-03-01', removedOn: null },
  { id: 'A11', kind: 'DC', hazard: 'low', installedOn: null, removedOn: null },
];

const pass = (assemblyId: string, testedOn: string): SummaryReport => ({ assemblyId, testedOn, initialOutcome: 'pass', outcome: 'pass' });
const reports: SummaryReport[] = [
  pass('A1', '2023-04-10'),
  pass('A1', '2024-04-08'), // tested, passed on the first test
  pass('A1', '2025-01-05'), // next year: ignored
  pass('A2', '2023-06-05'),
  { assemblyId: 'A2', testedOn: '2024-06-03', initialOutcome: 'fail', outcome: 'pass' }, // failed, repaired on the same report
  pass('A3', '2023-02-01'),
  { assemblyId: 'A3', testedOn: '2024-02-05', initialOutcome: 'fail', outcome: 'fail' },
  pass('A3', '2024-02-20'), // failed, repaired by a later passing test
  pass('A4', '2023-03-01'),
  { assemblyId: 'A4', testedOn: '2024-11-20', initialOutcome: 'fail', outcome: 'fail' }, // repair due 2024-12-20 (low: 30 days) → overdue at year end
  pass('A5', '2023-05-10'), // due 2024-05-10, not tested → overdue
  pass('A6', '2024-08-15'), // new installation, tested at installation
  pass('A7', '2024-03-01'), // tested, then removed
  pass('A10', '2023-04-01'),
  { ...pass('A10', '2024-05-01'), accepted: false }, // returned report: does not count → overdue
];

const zero = { inService: 0, tested: 0, passedOnFirstTest: 0, failed: 0, repaired: 0, overdue: 0, newInstallations: 0, removed: 0 };

describe('summarizeProgramYear', () => {
  const summary = summarizeProgramYear({ year: 2024, assemblies, reports });

  it('counts each kind and hazard as checked by hand', () => {
    expect(summary.rows).toEqual([
      { kind: 'RP', hazard: 'high', inService: 3, tested: 3, passedOnFirstTest: 2, failed: 1, repaired: 1, overdue: 0, newInstallations: 1, removed: 0 },
      { kind: 'RPDA', hazard: 'severe', inService: 1, tested: 0, passedOnFirstTest: 0, failed: 0, repaired: 0, overdue: 1, newInstallations: 1, removed: 0 },
      { kind: 'DC', hazard: 'low', inService: 4, tested: 3, passedOnFirstTest: 1, failed: 2, repaired: 1, overdue: 2, newInstallations: 0, removed: 1 },
      { kind: 'PVB', hazard: 'low', inService: 1, tested: 0, passedOnFirstTest: 0, failed: 0, repaired: 0, overdue: 1, newInstallations: 0, removed: 0 },
    ]);
  });

  it('adds up the totals and subtotals', () => {
    expect(summary.totals).toEqual({ inService: 9, tested: 6, passedOnFirstTest: 3, failed: 3, repaired: 2, overdue: 4, newInstallations: 2, removed: 1 });
    expect(summary.byHazard.low).toEqual({ inService: 5, tested: 3, passedOnFirstTest: 1, failed: 2, repaired: 1, overdue: 3, newInstallations: 0, removed: 1 });
    expect(summary.byKind.SVB).toEqual(zero);
    expect(summary.year).toBe(2024);
  });

  it('counts an assembly once however many reports it has', () => {
    const many = summarizeProgramYear({ year: 2024, assemblies: [assemblies[0]!], reports: [pass('A1', '2024-01-10'), pass('A1', '2024-06-10'), pass('A1', '2024-11-10')] });
    expect(many.totals).toMatchObject({ tested: 1, passedOnFirstTest: 1 });
  });

  it('refuses a report for an assembly not in the list, or a bad year', () => {
    expect(() => summarizeProgramYear({ year: 2024, assemblies, reports: [pass('A99', '2024-01-01')] })).toThrow(RulesInputError);
    expect(() => summarizeProgramYear({ year: 24, assemblies, reports })).toThrow(/four-digit/);
  });
});
