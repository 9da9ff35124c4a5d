// Statement months are calendar months in the program's time zone, turned into UTC instants.
import { describe, expect, test } from "vitest";
import { dateInZone, isMonth, monthLabel, monthOf, monthPeriod, recentMonths, startOfDayInZone } from "@/lib/payments/periods";

describe("monthPeriod", () => {
  test.each([
    { label: "UTC, 30-day month", month: "2026-11", zone: "UTC", starts: "2026-11-01T00:00:00.000Z", ends: "2026-12-01T00:00:00.000Z", last: "2026-11-30" },
    { label: "six hours behind UTC", month: "2026-11", zone: "Etc/GMT+6", starts: "2026-11-01T06:00:00.000Z", ends: "2026-12-01T06:00:00.000Z", last: "2026-11-30" },
    { label: "December rolls into the next year", month: "2026-12", zone: "UTC", starts: "2026-12-01T00:00:00.000Z", ends: "2027-01-01T00:00:00.000Z", last: "2026-12-31" },
    { label: "February of a leap year", month: "2028-02", zone: "UTC", starts: "2028-02-01T00:00:00.000Z", ends: "2028-03-01T00:00:00.000Z", last: "2028-02-29" },
    { label: "a month that starts in daylight time and ends in standard time", month: "2026-10", zone: "America/Denver", starts: "2026-10-01T06:00:00.000Z", ends: "2026-11-01T06:00:00.000Z", last: "2026-10-31" },
    { label: "a month that ends in daylight time", month: "2026-03", zone: "America/Denver", starts: "2026-03-01T07:00:00.000Z", ends: "2026-04-01T06:00:00.000Z", last: "2026-03-31" },
  ])("$label", ({ month, zone, starts, ends, last }) => {
    const period = monthPeriod(month, zone)!;
    expect(period.startsAt.toISOString()).toBe(starts);
    expect(period.endsBefore.toISOString()).toBe(ends);
    expect(period.last).toBe(last);
  });

  test.each(["2026-13", "2026-00", "26-01", "2026-1", ""])("refuses %j", (month) => {
    expect(monthPeriod(month, "UTC")).toBeNull();
    expect(isMonth(month)).toBe(false);
  });
});

describe("helpers", () => {
  test("local midnight and back", () => {
    const start = startOfDayInZone("2026-07-04", "Etc/GMT+6");
    expect(start.toISOString()).toBe("2026-07-04T06:00:00.000Z");
    expect(dateInZone(start, "Etc/GMT+6")).toBe("2026-07-04");
    expect(dateInZone(new Date(start.getTime() - 1), "Etc/GMT+6")).toBe("2026-07-03");
  });

  test("monthOf uses the zone", () => {
    expect(monthOf(new Date("2026-12-01T03:00:00Z"), "Etc/GMT+6")).toBe("2026-11");
    expect(monthOf(new Date("2026-12-01T03:00:00Z"), "UTC")).toBe("2026-12");
  });

  test("recent months, newest first, across a year", () => {
    expect(recentMonths("2026-02", 4)).toEqual(["2026-02", "2026-01", "2025-12", "2025-11"]);
  });

  test("labels", () => {
    expect(monthLabel("2026-11")).toBe("November 2026");
  });
});
