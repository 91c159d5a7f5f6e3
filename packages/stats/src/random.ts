/**
 * Seeded pseudo-random numbers for simulations and demo data: Mulberry32 (uniform on [0, 1)) and
 * normal deviates by the Box-Muller transform. Not for cryptography.
 *
 * Source: Mulberry32 by Tommy Ettinger (public domain, memory); Box GEP, Muller ME, Ann Math
 * Stat 1958;29:610–611.
 *
 * @throws {Error} when the seed is not an integer.
 * @example
 * const random = seededRandom(42);
 * random.uniform(); // => 0.6011037519201636
 * random.normal(); // => 0.6546471106331666
 */
export function seededRandom(seed: number): {
  uniform: () => number;
  normal: (mean?: number, sd?: number) => number;
} {
  if (!Number.isInteger(seed)) throw new Error(`seededRandom: seed must be an integer, got ${seed}`);
  let state = seed >>> 0;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | null = null;
  const normal = (mean = 0, sd = 1) => {
    if (spare !== null) {
      const z = spare;
      spare = null;
      return mean + sd * z;
    }
    const u1 = 1 - uniform(); // in (0, 1], so the logarithm is finite
    const u2 = uniform();
    const radius = Math.sqrt(-2 * Math.log(u1));
    spare = radius * Math.sin(2 * Math.PI * u2);
    return mean + sd * radius * Math.cos(2 * Math.PI * u2);
  };
  return { uniform, normal };
}
