/** A small seeded generator (mulberry32): the same seed gives the same demo, every time. */
export interface Random {
  next(): number;
  int(min: number, max: number): number;
  pick<T>(items: readonly T[]): T;
  chance(probability: number): boolean;
  /** A number in [min, max] rounded to `decimals` places. */
  decimal(min: number, max: number, decimals?: number): number;
  weighted<T>(entries: readonly (readonly [T, number])[]): T;
  code(length: number): string;
}

export function createRandom(seed: number): Random {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  return {
    next,
    int,
    pick: (items) => items[Math.floor(next() * items.length)]!,
    chance: (p) => next() < p,
    decimal: (min, max, decimals = 1) => {
      const f = 10 ** decimals;
      return Math.round((min + next() * (max - min)) * f) / f;
    },
    weighted: (entries) => {
      const total = entries.reduce((s, [, w]) => s + w, 0);
      let r = next() * total;
      for (const [value, weight] of entries) {
        r -= weight;
        if (r < 0) return value;
      }
      return entries[entries.length - 1]![0];
    },
    code: (length) => {
      const alphabet = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";
      let s = "";
      for (let i = 0; i < length; i++) s += alphabet[int(0, alphabet.length - 1)];
      return s;
    },
  };
}
