// Money is integer cents: sums are exact, display divides only at the end, odd currencies are refused.
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { formatMoney, isCents, isSupportedCurrency, receiptNumberOf, sumCents } from "@/lib/payments/money";

describe("sumCents", () => {
  test.each([
    { label: "nothing", amounts: [], total: 0 },
    { label: "one fee", amounts: [1500], total: 1500 },
    { label: "fees that sum badly as floats (0.1 + 0.2)", amounts: [10, 20], total: 30 },
    { label: "many fees", amounts: Array.from({ length: 50 }, () => 1999), total: 99_950 },
  ])("$label", ({ amounts, total }) => {
    expect(sumCents(amounts)).toBe(total);
  });

  test.each([
    { label: "a fraction of a cent", amounts: [15.5] },
    { label: "a negative amount", amounts: [-1] },
    { label: "not a number", amounts: [Number.NaN] },
    { label: "an unsafe integer", amounts: [2 ** 53] },
  ])("refuses $label", ({ amounts }) => {
    expect(() => sumCents(amounts)).toThrow(RangeError);
  });

  test("is exact for any list of safe amounts (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 10_000_000 }), { maxLength: 100 }), (amounts) => {
        const total = sumCents(amounts);
        return Number.isSafeInteger(total) && total === amounts.reduce((a, b) => a + b, 0);
      }),
    );
  });
});

describe("formatMoney", () => {
  test.each([
    { cents: 1500, currency: "USD", text: "$15.00" },
    { cents: 1, currency: "USD", text: "$0.01" },
    { cents: 0, currency: "USD", text: "$0.00" },
    { cents: 123_456_789, currency: "USD", text: "$1,234,567.89" },
    { cents: 2550, currency: "CAD", text: "CA$25.50" },
  ])("$cents $currency → $text", ({ cents, currency, text }) => {
    expect(formatMoney(cents, currency)).toBe(text);
  });

  test("shows every cent of any amount (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 40 }), (cents) => {
        const digits = formatMoney(cents, "USD").replace(/[^0-9]/g, "");
        return digits === String(cents).padStart(3, "0");
      }),
    );
  });
});

describe("currencies and receipts", () => {
  test.each([
    { currency: "USD", ok: true },
    { currency: "CAD", ok: true },
    { currency: "JPY", ok: false },
    { currency: "usd", ok: false },
    { currency: "US", ok: false },
  ])("$currency supported: $ok", ({ currency, ok }) => {
    expect(isSupportedCurrency(currency)).toBe(ok);
  });

  test("isCents", () => {
    expect([0, 1500, 1.5, -3, "15"].map(isCents)).toEqual([true, true, false, false, false]);
  });

  test("receipt numbers are padded and prefixed by the program", () => {
    expect(receiptNumberOf("QV", 42)).toBe("QV-FEE-000042");
  });
});
