import { addMonths as addMonthsReference, differenceInCalendarDays } from 'date-fns';
import fc from 'fast-check';
import { describe, expect, it, test } from 'vitest';
import { RulesInputError, addDays, addMonths, daysBetween, fromDayNumber, isIsoDate, nextTestDue, parseIsoDateTime, toDayNumber } from '@/lib/rules';

// Reference arithmetic on local-noon Date objects: a calendar computation independent of the machine's zone.
function referenceDate(iso: string): Date {
  return new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)), 12);
}
function isoOf(date: Date): string {
  return `${String(date.getFullYear()).padStart(4, '0')}-${String(date.getMonth() + 1).padStart(2, '0')}-${String(date.getDate()).padStart(2, '0')}`;
}

const isoDateArbitrary = fc
  .record({ year: fc.integer({ min: 1900, max: 2200 }), month: fc.integer({ min: 1, max: 12 }), day: fc.integer({ min: 1, max: 31 }) })
  .map(({ year, month, day }) => {
    const last = new Date(year, month, 0, 12).getDate();
    return `${year}-${String(month).padStart(2, '0')}-${String(Math.min(day, last)).padStart(2, '0')}`;
  });

describe('nextTestDue', () => {
  test.each([
    ['2024-02-29', 12, '2025-02-28'],
    ['2024-02-29', 48, '2028-02-29'],
    ['2023-05-15', 12, '2024-05-15'],
    ['2024-01-31', 1, '2024-02-29'],
    ['2023-01-31', 1, '2023-02-28'],
    ['2024-12-31', 2, '2025-02-28'],
    ['2024-08-31', 24, '2026-08-31'],
  ])('%s + %i months = %s', (from, months, due) => {
    expect(nextTestDue(from, months)).toBe(due);
  });

  it('defaults to 12 months', () => {
    expect(nextTestDue('2024-06-30')).toBe('2025-06-30');
  });

  it('refuses a malformed date or interval with a clear error', () => {
    expect(() => nextTestDue('2023-02-29')).toThrow(RulesInputError);
    expect(() => nextTestDue('24-1-1')).toThrow(/YYYY-MM-DD/);
    expect(() => nextTestDue('2024-01-01', 0)).toThrow(/intervalMonths/);
    expect(() => nextTestDue('2024-01-01', 1.5)).toThrow(RulesInputError);
  });

  it('matches date-fns addMonths for any date and interval, leap years included', () => {
    fc.assert(
      fc.property(isoDateArbitrary, fc.integer({ min: -60, max: 120 }), (date, months) => {
        expect(addMonths(date, months)).toBe(isoOf(addMonthsReference(referenceDate(date), months)));
      }),
      { numRuns: 2000 },
    );
  });

  it('always clamps Feb 29 to Feb 28 in a common year', () => {
    for (const year of [2000, 2004, 2024, 2096]) expect(nextTestDue(`${year}-02-29`)).toBe(`${year + 1}-02-28`);
  });
});

describe('day arithmetic', () => {
  it('matches date-fns day differences', () => {
    fc.assert(
      fc.property(isoDateArbitrary, isoDateArbitrary, (a, b) => {
        expect(daysBetween(a, b)).toBe(differenceInCalendarDays(referenceDate(b), referenceDate(a)));
      }),
      { numRuns: 1000 },
    );
  });

  it('round-trips day numbers', () => {
    fc.assert(
      fc.property(isoDateArbitrary, (date) => {
        expect(fromDayNumber(toDayNumber(date))).toBe(date);
      }),
    );
    expect(toDayNumber('1970-01-01')).toBe(0);
    expect(addDays('2024-02-28', 1)).toBe('2024-02-29');
    expect(addDays('2023-02-28', 1)).toBe('2023-03-01');
    expect(addDays('2024-03-01', -1)).toBe('2024-02-29');
    expect(addDays('2000-02-28', 1)).toBe('2000-02-29');
    expect(addDays('2100-02-28', 1)).toBe('2100-03-01');
  });

  test.each([
    ['2024-02-29', true],
    ['2023-02-29', false],
    ['2100-02-29', false],
    ['2024-13-01', false],
    ['2024-04-31', false],
    ['2024-4-30', false],
    [20240430, false],
  ])('isIsoDate(%s) = %s', (value, expected) => {
    expect(isIsoDate(value)).toBe(expected);
  });

  it('reads datetimes only with an explicit offset', () => {
    expect(parseIsoDateTime('2024-05-02T14:30:00Z', 'at')).toBe(Date.UTC(2024, 4, 2, 14, 30));
    expect(parseIsoDateTime('2024-05-02T16:30:00+02:00', 'at')).toBe(Date.UTC(2024, 4, 2, 14, 30));
    expect(parseIsoDateTime('2024-05-02T14:30Z', 'at')).toBe(Date.UTC(2024, 4, 2, 14, 30));
    expect(() => parseIsoDateTime('2024-05-02T14:30:00', 'at')).toThrow(RulesInputError);
    expect(() => parseIsoDateTime('2024-02-30T14:30:00Z', 'at')).toThrow(RulesInputError);
  });
});
