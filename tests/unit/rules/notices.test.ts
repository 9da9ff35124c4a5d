import { describe, expect, it, test } from 'vitest';
import {
  RulesInputError,
  addDays,
  defaultNoticeSchedule,
  noticeKey,
  noticeStageOf,
  noticeThresholds,
  planNotices,
  validateNoticeSchedule,
  type NoticeCandidate,
  type PlannedNotice,
} from '@/lib/rules';

const assemblies: NoticeCandidate[] = [
  { id: 'A', baseState: 'active', nextDueOn: '2024-03-30', repairDueOn: null },
  { id: 'B', baseState: 'active', nextDueOn: '2024-02-29', repairDueOn: null },
  { id: 'C', baseState: 'failed', nextDueOn: '2024-01-15', repairDueOn: '2024-03-07' },
  { id: 'D', baseState: 'inactive', nextDueOn: '2023-01-01', repairDueOn: null },
  { id: 'E', baseState: 'active', nextDueOn: null, repairDueOn: null },
  { id: 42, baseState: 'active', nextDueOn: '2024-03-20', repairDueOn: null, ownerHasEmail: false },
];

const summary = (notices: PlannedNotice[]) => notices.map((notice) => `${notice.assemblyId}:${notice.kind}`);

describe('notice schedule', () => {
  it('defaults to reminder 30 days before, overdue the day after, final at 30 days, repair reminder 7 days before', () => {
    // Owner notices: first reminder 30–45 days before due, overdue notice, final notice [S].
    expect(defaultNoticeSchedule).toEqual({ reminderDaysBefore: 30, overdueDaysAfter: 1, finalDaysAfter: 30, repairReminderDaysBefore: 7 });
    expect(validateNoticeSchedule(defaultNoticeSchedule)).toEqual([]);
    expect(validateNoticeSchedule({ reminderDaysBefore: 45, overdueDaysAfter: 15, finalDaysAfter: 30, repairReminderDaysBefore: 0 })).toEqual([]);
  });

  test.each([
    ['a negative reminder', { reminderDaysBefore: -5 }, 'reminderDaysBefore', /negative/],
    ['a fractional day', { finalDaysAfter: 30.5 }, 'finalDaysAfter', /whole number/],
    ['an overdue notice on the due date', { overdueDaysAfter: 0 }, 'overdueDaysAfter', /at least 1 day/],
    ['a final notice before the overdue notice', { overdueDaysAfter: 30, finalDaysAfter: 14 }, 'finalDaysAfter', /must come after/],
    ['a final notice on the same day as the overdue notice', { overdueDaysAfter: 14, finalDaysAfter: 14 }, 'finalDaysAfter', /must come after/],
    ['a missing value', { repairReminderDaysBefore: undefined }, 'repairReminderDaysBefore', /whole number/],
  ])('refuses %s', (_label, change, field, message) => {
    const problems = validateNoticeSchedule({ ...defaultNoticeSchedule, ...change });
    expect(problems).toHaveLength(1);
    expect(problems[0]!.field).toBe(field);
    expect(problems[0]!.message).toMatch(message);
  });

  it('refuses to plan with a broken schedule', () => {
    expect(() => planNotices({ today: '2024-02-29', schedule: { ...defaultNoticeSchedule, finalDaysAfter: 1 }, assemblies, alreadySent: new Set() })).toThrow(RulesInputError);
  });

  it('gives SQL-friendly thresholds (leap year)', () => {
    expect(noticeThresholds('2024-02-29')).toEqual({
      today: '2024-02-29',
      reminderIfDueOnOrBefore: '2024-03-30',
      overdueIfDueOnOrBefore: '2024-02-28',
      finalIfDueOnOrBefore: '2024-01-30',
      repairReminderIfDueOnOrBefore: '2024-03-07',
    });
  });
});

describe('planNotices on a fixed calendar', () => {
  it('plans the notices due on 2024-02-29', () => {
    const notices = planNotices({ today: '2024-02-29', assemblies, alreadySent: new Set() });
    expect(summary(notices)).toEqual(['A:reminder', 'B:reminder', 'C:repair_reminder', '42:reminder']);
    expect(notices[0]).toEqual({ key: 'A:reminder:2024-03-30', kind: 'reminder', assemblyId: 'A', dueCycle: '2024-03-30', channel: 'email' });
    expect(notices[2]).toMatchObject({ dueCycle: '2024-03-07', key: noticeKey('C', 'repair_reminder', '2024-03-07') });
    expect(notices[3]).toMatchObject({ assemblyId: 42, channel: 'letter' });
  });

  it('plans nothing on a re-run the same day', () => {
    const first = planNotices({ today: '2024-02-29', assemblies, alreadySent: new Set() });
    const sent = new Set(first.map((notice) => notice.key));
    expect(planNotices({ today: '2024-02-29', assemblies, alreadySent: sent })).toEqual([]);
  });

  it('plans nothing the day before the first reminder', () => {
    expect(summary(planNotices({ today: '2024-02-28', assemblies: [assemblies[0]!], alreadySent: new Set() }))).toEqual([]);
  });

  it('sends the overdue notice the day after the due date, not on it', () => {
    const sent = new Set([noticeKey('B', 'reminder', '2024-02-29')]);
    expect(planNotices({ today: '2024-02-29', assemblies: [assemblies[1]!], alreadySent: sent })).toEqual([]);
    expect(summary(planNotices({ today: '2024-03-01', assemblies: [assemblies[1]!], alreadySent: sent }))).toEqual(['B:overdue']);
    expect(summary(planNotices({ today: '2024-03-30', assemblies: [assemblies[1]!], alreadySent: new Set([...sent, noticeKey('B', 'overdue', '2024-02-29')]) }))).toEqual(['B:final']);
  });

  it('sends only the furthest stage after days without a run', () => {
    // B was due 2024-02-29 and nothing was sent: on 2024-03-30 (30 days overdue) only the final notice goes out.
    expect(summary(planNotices({ today: '2024-03-30', assemblies: [assemblies[1]!], alreadySent: new Set() }))).toEqual(['B:final']);
    expect(summary(planNotices({ today: '2024-03-29', assemblies: [assemblies[1]!], alreadySent: new Set() }))).toEqual(['B:overdue']);
  });

  it('never sends a stage after a later one of the same cycle', () => {
    const sent = new Set([noticeKey('A', 'final', '2024-03-30')]);
    expect(planNotices({ today: '2024-03-31', assemblies: [assemblies[0]!], alreadySent: sent })).toEqual([]);
    expect(planNotices({ today: '2024-03-01', assemblies: [assemblies[0]!], alreadySent: new Set([noticeKey('A', 'overdue', '2024-03-30')]) })).toEqual([]);
  });

  it('starts a fresh cycle when the due date moves after a passing test', () => {
    const sent = new Set([noticeKey('A', 'reminder', '2024-03-30'), noticeKey('A', 'overdue', '2024-03-30')]);
    const tested: NoticeCandidate = { id: 'A', baseState: 'active', nextDueOn: '2025-04-02', repairDueOn: null };
    expect(planNotices({ today: '2024-04-05', assemblies: [tested], alreadySent: sent })).toEqual([]);
    expect(summary(planNotices({ today: '2025-03-03', assemblies: [tested], alreadySent: sent }))).toEqual(['A:reminder']);
  });

  it('sends repair reminders only up to the repair deadline, and no routine notices while failed', () => {
    const failed = assemblies[2]!;
    expect(planNotices({ today: '2024-02-28', assemblies: [failed], alreadySent: new Set() })).toEqual([]);
    expect(summary(planNotices({ today: '2024-03-07', assemblies: [failed], alreadySent: new Set() }))).toEqual(['C:repair_reminder']);
    expect(planNotices({ today: '2024-03-08', assemblies: [failed], alreadySent: new Set() })).toEqual([]);
  });

  it('sends nothing to inactive assemblies or those without a due date', () => {
    expect(planNotices({ today: '2030-01-01', assemblies: [assemblies[3]!, assemblies[4]!], alreadySent: new Set() })).toEqual([]);
  });

  it('refuses a malformed stored date with the row named', () => {
    expect(() => planNotices({ today: '2024-02-29', assemblies: [{ id: 'Z', baseState: 'active', nextDueOn: '29/02/2024', repairDueOn: null }], alreadySent: new Set() })).toThrow(/assemblies\[0\]\.nextDueOn/);
  });
});

describe('a year of daily batch runs', () => {
  const fleet: NoticeCandidate[] = Array.from({ length: 60 }, (_, index) => ({
    id: `asm-${index}`,
    baseState: index % 10 === 9 ? 'failed' : 'active',
    nextDueOn: addDays('2024-01-15', index * 6),
    repairDueOn: index % 10 === 9 ? addDays('2024-01-20', index * 5) : null,
  }));

  function simulate(everyDays: number) {
    const sent = new Set<string>();
    const log: PlannedNotice[] = [];
    for (let day = 0; day <= 366; day += everyDays) {
      const today = addDays('2024-01-01', day);
      const planned = planNotices({ today, assemblies: fleet, alreadySent: sent });
      const perAssembly = new Set<string | number>();
      for (const notice of planned) {
        expect(perAssembly.has(notice.assemblyId)).toBe(false);
        perAssembly.add(notice.assemblyId);
        expect(sent.has(notice.key)).toBe(false);
        sent.add(notice.key);
        log.push(notice);
      }
      expect(planNotices({ today, assemblies: fleet, alreadySent: sent })).toEqual([]);
    }
    return log;
  }

  it('sends reminder, overdue and final exactly once each per cycle when run every day', () => {
    const log = simulate(1);
    for (const assembly of fleet.filter((candidate) => candidate.baseState === 'active')) {
      const kinds = log.filter((notice) => notice.assemblyId === assembly.id).map((notice) => notice.kind);
      const dueInRange = assembly.nextDueOn! <= addDays('2024-01-01', 366 - 30);
      // Every due date is on or after 2024-01-15, so even the first run (2024-01-01) is still in the reminder stage.
      if (dueInRange) expect(kinds).toEqual(['reminder', 'overdue', 'final']);
    }
    for (const assembly of fleet.filter((candidate) => candidate.baseState === 'failed')) {
      expect(log.filter((notice) => notice.assemblyId === assembly.id).map((notice) => notice.kind)).toEqual(['repair_reminder']);
    }
  });

  it('never sends two stages of one cycle on the same day when runs are 10 days apart', () => {
    const log = simulate(10);
    expect(log.length).toBeGreaterThan(0);
    const keys = log.map((notice) => notice.key);
    expect(new Set(keys).size).toBe(keys.length);
  });
});

describe('noticeStageOf', () => {
  it('returns the furthest stage sent for the current cycle', () => {
    const sent = new Set([noticeKey('A', 'reminder', '2024-03-30'), noticeKey('A', 'overdue', '2024-03-30'), noticeKey('B', 'final', '2023-02-28'), noticeKey('C', 'repair_reminder', '2024-03-07')]);
    expect(noticeStageOf(assemblies[0]!, sent)).toBe('overdue');
    expect(noticeStageOf(assemblies[1]!, sent)).toBeNull();
    expect(noticeStageOf(assemblies[2]!, sent)).toBe('repair_reminder');
    expect(noticeStageOf(assemblies[3]!, sent)).toBeNull();
  });
});
