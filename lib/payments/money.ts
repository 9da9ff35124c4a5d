/**
 * Money is integer minor units (cents) with an ISO 4217 currency code, never a float. These
 * helpers are pure: the browser may use them to display what the server computed.
 */

/** Currencies whose minor unit is not 1/100 are refused rather than mis-scaled. */
const twoDecimalCurrency = /^[A-Z]{3}$/;
const zeroDecimalCurrencies = new Set(["BIF", "CLP", "DJF", "GNF", "JPY", "KMF", "KRW", "MGA", "PYG", "RWF", "UGX", "VND", "VUV", "XAF", "XOF", "XPF"]);

export function isSupportedCurrency(currency: string): boolean {
  return twoDecimalCurrency.test(currency) && !zeroDecimalCurrencies.has(currency);
}

export function isCents(value: unknown): value is number {
  return typeof value === "number" && Number.isSafeInteger(value) && value >= 0;
}

/** Sums cents exactly; throws on anything that is not a non-negative safe integer. */
export function sumCents(amounts: readonly number[]): number {
  let total = 0;
  for (const amount of amounts) {
    if (!isCents(amount)) throw new RangeError(`Not an amount in cents: ${String(amount)}`);
    total += amount;
    if (!Number.isSafeInteger(total)) throw new RangeError("The total is too large.");
  }
  return total;
}

/** "$15.00" for (1500, "USD"); the amount is divided only for display. */
export function formatMoney(cents: number, currency: string, locale = "en-US"): string {
  // Any safe integer divided by 100 is within far less than half a cent of its exact value.
  return new Intl.NumberFormat(locale, { style: "currency", currency, minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(cents / 100);
}

/** A receipt's number, derived from the program's report prefix and the payment id. */
export function receiptNumberOf(reportPrefix: string, paymentId: number): string {
  return `${reportPrefix}-FEE-${String(paymentId).padStart(6, "0")}`;
}
