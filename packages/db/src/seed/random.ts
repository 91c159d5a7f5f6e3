/**
 * A small seeded random source so the demo network is the same on every machine.
 * mulberry32 (a 32-bit generator, public domain) for uniforms; Box-Muller for normals.
 */
export type RandomSource = {
  /** Uniform in [0, 1). */
  uniform: () => number;
  /** Normal with the given mean and SD. */
  normal: (mean?: number, sd?: number) => number;
  /** Integer in [min, max], both included. */
  integer: (min: number, max: number) => number;
};

export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function createRandom(seed: number): RandomSource {
  const uniform = mulberry32(seed);
  // Box-Muller yields two normals per pair of uniforms; keep the second for the next call.
  let spare: number | null = null;
  const standardNormal = (): number => {
    if (spare !== null) {
      const value = spare;
      spare = null;
      return value;
    }
    let u1 = uniform();
    while (u1 === 0) u1 = uniform(); // log(0) is -Infinity
    const u2 = uniform();
    const radius = Math.sqrt(-2 * Math.log(u1));
    spare = radius * Math.sin(2 * Math.PI * u2);
    return radius * Math.cos(2 * Math.PI * u2);
  };
  return {
    uniform,
    normal: (mean = 0, sd = 1) => mean + sd * standardNormal(),
    integer: (min, max) => min + Math.floor(uniform() * (max - min + 1)),
  };
}
