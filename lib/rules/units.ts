/**
 * Pressure units. 1 psi = 6.894 757 kPa (NIST Special Publication 811, 2008 ed., App. B.8–B.9).
 * The factor is derived exactly from the pound (0.453 592 37 kg), standard gravity
 * (9.806 65 m/s²) and the inch (0.0254 m): 0.45359237 × 9.80665 ÷ 0.0254² Pa = 6 894.757 293 168 361… Pa.
 * A rounded factor would make a kPa reading that meets a psid minimum fail it.
 */
export const KPA_PER_PSI = 6.894757293168361;

/**
 * Tolerance for float noise only, in psid. A kPa → psid round trip can move a value by a few
 * units in the last place (≈ 1e-15); 1e-9 psid absorbs that and is eight orders of magnitude
 * below a gauge's 0.1 psid resolution, so it never lets a genuinely lower reading pass.
 * It is not a tolerance band: a kit's ± accuracy is never added (common practice, no published
 * rule allows a band [M]).
 */
export const COMPARISON_EPSILON_PSID = 1e-9;

/** Units a differential reading can be entered in. */
export type ReadingUnit = 'psid' | 'kPa';

/** psid → kPa with the exact NIST factor. */
export function psidToKpa(psid: number): number {
  return psid * KPA_PER_PSI;
}

/** kPa → psid with the exact NIST factor (division, so kpaToPsid(psidToKpa(x)) is x to the last bits). */
export function kpaToPsid(kpa: number): number {
  return kpa / KPA_PER_PSI;
}

/** True when an observed value meets an inclusive minimum ("at least"), ignoring float noise only (psid, or inches for an air gap). */
export function meetsMinimum(observed: number, minimum: number): boolean {
  return observed >= minimum - COMPARISON_EPSILON_PSID;
}

/** True when a is strictly greater than b beyond float noise (equal readings are not "greater"). */
export function isClearlyGreater(a: number, b: number): boolean {
  return a > b + COMPARISON_EPSILON_PSID;
}

/** Removes float noise from a derived value (e.g. 5.3 − 2.3 → 3) so records and screens show what the tester meant. */
export function roundAwayFloatNoise(value: number): number {
  return Math.round(value * 1e9) / 1e9;
}

/** One decimal, halves rounded up once float noise is removed (1.15 → "1.2"), never "-0.0": how psid readings are shown everywhere. */
export function formatPsid(psid: number): string {
  return formatOneDecimal(psid);
}

/** One decimal for kPa, the same way as formatPsid. */
export function formatKpa(kpa: number): string {
  return formatOneDecimal(kpa);
}

/** A reading in the unit it was entered in, with the unit: "2.5 psid", "17.2 kPa". */
export function formatReading(value: number, unit: ReadingUnit): string {
  return `${formatOneDecimal(value)} ${unit}`;
}

/**
 * A minimum for display, with as many decimals as it needs (1 to 3): a local edition's 2.25
 * must not be shown as 2.3.
 */
export function formatMinimum(value: number): string {
  for (let decimals = 1; decimals < 3; decimals++) {
    const scale = 10 ** decimals;
    if (Math.abs(Math.round(value * scale) / scale - value) < 1e-9) return (Math.round(value * scale) / scale).toFixed(decimals);
  }
  return (Math.round(value * 1000) / 1000).toFixed(3);
}

/**
 * A psid minimum expressed in kPa for display, rounded UP to one decimal: any reading at or
 * above the displayed kPa value passes (13.8 kPa ≥ 2.0 psid), so the screen never shows a
 * threshold that would itself fail.
 */
export function formatMinimumInKpa(minimumPsid: number): string {
  const tenths = Math.ceil(psidToKpa(minimumPsid) * 10 - 1e-6);
  return tenths === 0 ? '0.0' : (tenths / 10).toFixed(1);
}

function formatOneDecimal(value: number): string {
  const tenths = Math.round(roundAwayFloatNoise(value * 10));
  if (tenths === 0) return '0.0';
  return (tenths / 10).toFixed(1);
}
