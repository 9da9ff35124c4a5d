import fc from 'fast-check';
import { describe, expect, it, test } from 'vitest';
import {
  RulesInputError,
  addDays,
  complianceStateOn,
  complianceThresholds,
  daysBetween,
  defaultProgramRules,
  deriveAssemblyFacts,
  dueDateAfterPass,
  validateProgramRules,
  type AssemblyFacts,
  type AssemblyHistory,
  type ProgramRules,
} from '@/lib/rules';

const history = (overrides: Partial<AssemblyHistory> = {}): AssemblyHistory => ({ status: 'active', installedOn: '2019-04-02', hazard: 'high', tests: [], ...overrides });
const windowRules = (startMonthDay: string, endMonthDay: string, testIntervalMonths = 12): ProgramRules => ({ ...defaultProgramRules, testIntervalMonths, dueModel: { kind: 'window', startMonthDay, endMonthDay } });

describe('defaultProgramRules', () => {
  it('holds the program defaults', () => {
    // Yearly test (WAC 246-290-490(7)(b)); repair 14 days high / 30 low [S]; reports within 10 days [S].
    expect(defaultProgramRules).toEqual({ testIntervalMonths: 12, dueModel: { kind: 'anniversary' }, dueSoonDays: 30, repairDays: { severe: 14, high: 14, low: 30 }, reportDeadlineDays: 10 });
    expect(validateProgramRules(defaultProgramRules)).toEqual([]);
  });

  it('refuses unusable settings with messages', () => {
    expect(validateProgramRules({ ...defaultProgramRules, testIntervalMonths: 0 }).map((problem) => problem.path)).toEqual(['testIntervalMonths']);
    expect(validateProgramRules({ ...defaultProgramRules, repairDays: { severe: 7, high: -1, low: 30 } }).map((problem) => problem.path)).toEqual(['repairDays.high']);
    expect(validateProgramRules(windowRules('13-01', '05-31')).map((problem) => problem.path)).toEqual(['dueModel.startMonthDay']);
    expect(validateProgramRules(windowRules('01-01', '05-31', 18)).map((problem) => problem.path)).toEqual(['testIntervalMonths']);
    expect(() => deriveAssemblyFacts(history(), { ...defaultProgramRules, dueSoonDays: -3 })).toThrow(RulesInputError);
  });
});

describe('deriveAssemblyFacts', () => {
  it('makes a never-tested assembly due at installation, or leaves the due date unknown', () => {
    // New installations are tested at installation (WAC 246-290-490(7)(b); OAR 333-061-0070(6)).
    expect(deriveAssemblyFacts(history({ installedOn: '2024-02-29' }))).toEqual({ lastTestedOn: null, lastOutcome: null, lastPassedOn: null, nextDueOn: '2024-02-29', repairDueOn: null, baseState: 'active' });
    expect(deriveAssemblyFacts(history({ installedOn: null })).nextDueOn).toBeNull();
  });

  it('puts the next test on the anniversary of the last pass, Feb 29 falling on Feb 28', () => {
    const facts = deriveAssemblyFacts(history({ tests: [{ testedOn: '2023-03-01', outcome: 'pass' }, { testedOn: '2024-02-29', outcome: 'pass' }] }));
    expect(facts).toMatchObject({ lastTestedOn: '2024-02-29', lastOutcome: 'pass', lastPassedOn: '2024-02-29', nextDueOn: '2025-02-28', repairDueOn: null, baseState: 'active' });
  });

  test.each([
    ['severe', '2024-05-24'],
    ['high', '2024-05-24'],
    ['low', '2024-06-09'],
  ] as const)('after a failure of a %s hazard the repair is due on %s and the test due date stays', (hazard, repairDueOn) => {
    const facts = deriveAssemblyFacts(history({ hazard, tests: [{ testedOn: '2023-06-01', outcome: 'pass' }, { testedOn: '2024-05-10', outcome: 'fail' }] }));
    expect(facts).toEqual({ lastTestedOn: '2024-05-10', lastOutcome: 'fail', lastPassedOn: '2023-06-01', nextDueOn: '2024-06-01', repairDueOn, baseState: 'failed' });
  });

  it('keeps the repair deadline of the first failure when the assembly fails again', () => {
    const facts = deriveAssemblyFacts(history({ tests: [{ testedOn: '2024-05-20', outcome: 'fail' }, { testedOn: '2023-06-01', outcome: 'pass' }, { testedOn: '2024-05-10', outcome: 'fail' }] }));
    expect(facts.repairDueOn).toBe('2024-05-24');
    expect(facts.lastTestedOn).toBe('2024-05-20');
  });

  it('starts a new cycle when a failed assembly passes after repair', () => {
    const facts = deriveAssemblyFacts(history({ tests: [{ testedOn: '2024-05-10', outcome: 'fail' }, { testedOn: '2024-05-20', outcome: 'pass' }] }));
    expect(facts).toMatchObject({ lastOutcome: 'pass', lastPassedOn: '2024-05-20', nextDueOn: '2025-05-20', repairDueOn: null, baseState: 'active' });
  });

  it('keeps the order given for tests on the same day', () => {
    const tests = [{ testedOn: '2024-05-10', outcome: 'fail' as const }, { testedOn: '2024-05-10', outcome: 'pass' as const }];
    expect(deriveAssemblyFacts(history({ tests })).baseState).toBe('active');
    expect(deriveAssemblyFacts(history({ tests: [...tests].reverse() })).baseState).toBe('failed');
  });

  it('ignores returned reports', () => {
    const facts = deriveAssemblyFacts(history({ tests: [{ testedOn: '2023-06-01', outcome: 'pass' }, { testedOn: '2024-05-10', outcome: 'pass', accepted: false }] }));
    expect(facts.lastPassedOn).toBe('2023-06-01');
  });

  it('makes a test due at once after a relocation, reinstallation or incident after the last pass', () => {
    const tests = [{ testedOn: '2024-03-01', outcome: 'pass' as const }];
    expect(deriveAssemblyFacts(history({ tests, events: [{ on: '2024-08-01', kind: 'relocated' }] })).nextDueOn).toBe('2024-08-01');
    expect(deriveAssemblyFacts(history({ tests, events: [{ on: '2024-03-01', kind: 'incident' }] })).nextDueOn).toBe('2025-03-01');
    expect(deriveAssemblyFacts(history({ tests, events: [{ on: '2023-12-01', kind: 'reinstalled' }] })).nextDueOn).toBe('2025-03-01');
  });

  test.each(['removed', 'replaced', 'inactive', 'awaiting_confirmation'] as const)('an assembly %s is inactive with no due dates', (status) => {
    const facts = deriveAssemblyFacts(history({ status, tests: [{ testedOn: '2024-05-10', outcome: 'fail' }] }));
    expect(facts).toMatchObject({ baseState: 'inactive', nextDueOn: null, repairDueOn: null, lastOutcome: 'fail' });
    expect(complianceStateOn(facts, '2030-01-01')).toBe('inactive');
  });

  it('refuses bad history with the field named', () => {
    expect(() => deriveAssemblyFacts(history({ tests: [{ testedOn: '2024-13-01', outcome: 'pass' }] }))).toThrow(/tests\.0\.testedOn/);
    expect(() => deriveAssemblyFacts(history({ status: 'gone' as never }))).toThrow(RulesInputError);
    expect(() => deriveAssemblyFacts(history({ hazard: 'medium' as never }))).toThrow(RulesInputError);
  });
});

describe('yearly window due dates', () => {
  // A fixed yearly window (e.g. 1 January to 31 May) is a due-date model used by programs [S].
  test.each([
    ['a test inside the window', '01-01', '05-31', 12, '2024-03-10', '2025-05-31'],
    ['a test on the first day of the window', '01-01', '05-31', 12, '2025-01-01', '2026-05-31'],
    ['a test after the window closed', '01-01', '05-31', 12, '2024-09-15', '2025-05-31'],
    ['a test just before the next window opens', '01-01', '05-31', 12, '2024-12-20', '2025-05-31'],
    ['a two-year interval', '01-01', '05-31', 24, '2024-03-10', '2026-05-31'],
    ['a window over the new year, test inside it', '11-01', '02-29', 12, '2024-12-15', '2026-02-28'],
    ['a window over the new year ending on a leap day', '11-01', '02-29', 12, '2022-12-15', '2024-02-29'],
    ['a window over the new year, test between windows', '11-01', '02-29', 12, '2025-03-10', '2026-02-28'],
  ])('%s', (_label, start, end, interval, passedOn, due) => {
    expect(dueDateAfterPass(passedOn, windowRules(start, end, interval))).toBe(due);
  });

  it('uses the window for the assembly facts too', () => {
    expect(deriveAssemblyFacts(history({ tests: [{ testedOn: '2024-04-02', outcome: 'pass' }] }), windowRules('01-01', '05-31')).nextDueOn).toBe('2025-05-31');
  });
});

describe('complianceStateOn', () => {
  const passedLeapDay = deriveAssemblyFacts(history({ tests: [{ testedOn: '2024-02-29', outcome: 'pass' }] }));

  test.each([
    ['2024-03-01', 'current'],
    ['2025-01-28', 'current'],
    ['2025-01-29', 'due_soon'],
    ['2025-02-28', 'due_soon'],
    ['2025-03-01', 'overdue'],
  ])('passed on 2024-02-29 (due 2025-02-28): on %s it is %s', (today, state) => {
    expect(complianceStateOn(passedLeapDay, today)).toBe(state);
  });

  test.each([
    ['2024-05-24', 'failed_awaiting_repair'],
    ['2024-05-25', 'repair_overdue'],
  ])('failed on 2024-05-10, repair due 2024-05-24: on %s it is %s', (today, state) => {
    const facts = deriveAssemblyFacts(history({ tests: [{ testedOn: '2023-06-01', outcome: 'pass' }, { testedOn: '2024-05-10', outcome: 'fail' }] }));
    expect(complianceStateOn(facts, today)).toBe(state);
  });

  it('shows a never-tested assembly as overdue after its installation day, or never tested when that is unknown', () => {
    const installed = deriveAssemblyFacts(history({ installedOn: '2024-02-29' }));
    expect(complianceStateOn(installed, '2024-02-29')).toBe('due_soon');
    expect(complianceStateOn(installed, '2024-03-01')).toBe('overdue');
    expect(complianceStateOn(deriveAssemblyFacts(history({ installedOn: null })), '2024-03-01')).toBe('never_tested');
  });

  it('gives the thresholds SQL compares with', () => {
    expect(complianceThresholds('2024-02-10')).toEqual({ today: '2024-02-10', dueSoonUntil: '2024-03-11' });
    expect(complianceThresholds('2023-02-10')).toEqual({ today: '2023-02-10', dueSoonUntil: '2023-03-12' });
    expect(complianceThresholds('2024-02-10', { ...defaultProgramRules, dueSoonDays: 45 }).dueSoonUntil).toBe('2024-03-26');
  });

  it('agrees with a definition by day counts for any dates', () => {
    const date = fc.integer({ min: 0, max: 3000 }).map((offset) => addDays('2022-01-01', offset));
    fc.assert(
      fc.property(date, fc.option(date, { nil: null }), fc.option(date, { nil: null }), fc.constantFrom('active', 'failed', 'inactive') as fc.Arbitrary<AssemblyFacts['baseState']>, (today, nextDueOn, repairDate, baseState) => {
        const repairDueOn = baseState === 'failed' ? (repairDate ?? today) : null;
        const facts: AssemblyFacts = { lastTestedOn: null, lastOutcome: null, lastPassedOn: null, nextDueOn, repairDueOn, baseState };
        const state = complianceStateOn(facts, today);
        let expected: string;
        if (baseState === 'inactive') expected = 'inactive';
        else if (baseState === 'failed') expected = daysBetween(repairDueOn!, today) > 0 ? 'repair_overdue' : 'failed_awaiting_repair';
        else if (nextDueOn === null) expected = 'never_tested';
        else if (daysBetween(nextDueOn, today) > 0) expected = 'overdue';
        else if (daysBetween(today, nextDueOn) <= 30) expected = 'due_soon';
        else expected = 'current';
        expect(state).toBe(expected);
      }),
      { numRuns: 2000 },
    );
  });
});
