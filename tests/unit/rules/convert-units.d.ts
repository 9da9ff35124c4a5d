// convert-units 2.3.4 ships no types; the unit tests only use this chain to cross-check the kPa factor.
declare module 'convert-units' {
  interface Conversion {
    from(unit: string): { to(unit: string): number };
  }
  export default function convert(value: number): Conversion;
}
