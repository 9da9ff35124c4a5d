import convert from 'convert-units';
import fc from 'fast-check';
import { describe, expect, it, test } from 'vitest';
import { KPA_PER_PSI, formatMinimum, formatMinimumInKpa, formatPsid, kpaToPsid, meetsMinimum, psidToKpa } from '@/lib/rules';

describe('psid ↔ kPa', () => {
  it('uses the exact factor derived from the pound, standard gravity and the inch', () => {
    // NIST SP 811 (2008), App. B.8–B.9: 1 psi = 6.894 757 kPa; exactly 0.45359237 kg × 9.80665 m/s² ÷ 0.0254² m².
    expect(KPA_PER_PSI).toBe((0.45359237 * 9.80665) / (0.0254 * 0.0254) / 1000);
    expect(KPA_PER_PSI.toFixed(6)).toBe('6.894757');
    expect(psidToKpa(1)).toBe(KPA_PER_PSI);
  });

  it('agrees with an independent conversion library (which stores a rounded ratio)', () => {
    const reference = convert(1).from('psi').to('kPa');
    expect(Math.abs(reference - psidToKpa(1)) / psidToKpa(1)).toBeLessThan(1e-6);
    for (const psid of [0.1, 1, 2, 5, 15]) {
      expect(Math.abs(convert(psid).from('psi').to('kPa') - psidToKpa(psid)) / psidToKpa(psid)).toBeLessThan(1e-6);
      expect(Math.abs(convert(psidToKpa(psid)).from('kPa').to('psi') - psid) / psid).toBeLessThan(1e-6);
    }
  });

  it('round-trips any reading to 1e-12 relative', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e6, noNaN: true }), (psid) => {
        expect(Math.abs(kpaToPsid(psidToKpa(psid)) - psid) / psid).toBeLessThan(1e-12);
      }),
    );
  });

  it('keeps every tenth of the gauge range at or above itself after a round trip', () => {
    for (let tenths = 0; tenths <= 150; tenths++) {
      const psid = tenths / 10;
      expect(meetsMinimum(kpaToPsid(psidToKpa(psid)), psid)).toBe(true);
    }
  });
});

describe('display', () => {
  test.each([
    [2, '2.0'],
    [2.45, '2.5'],
    [1.15, '1.2'],
    [0.04, '0.0'],
    [-0.04, '0.0'],
    [14.96, '15.0'],
  ])('formatPsid(%s) = %s', (value, text) => {
    expect(formatPsid(value)).toBe(text);
  });

  test.each([
    [2, '13.8'],
    [5, '34.5'],
    [1, '6.9'],
    [3, '20.7'],
  ])('a %s psid minimum is shown as %s kPa, rounded up so the shown value itself passes', (psid, kpa) => {
    expect(formatMinimumInKpa(psid)).toBe(kpa);
    expect(meetsMinimum(kpaToPsid(Number(kpa)), psid)).toBe(true);
  });

  it('shows a local minimum with the decimals it needs', () => {
    expect(formatMinimum(2)).toBe('2.0');
    expect(formatMinimum(2.25)).toBe('2.25');
    expect(formatMinimum(1.125)).toBe('1.125');
  });
});
