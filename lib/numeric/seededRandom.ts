/**
 * A small seeded pseudo-random generator for reproducible synthetic data and resampling.
 * Uniform numbers: mulberry32 (a public-domain 32-bit generator, common practice); normal numbers: the
 * Box–Muller transform (Box & Muller 1958, Ann Math Stat 29:610 — recalled citation; the transform is
 * standard). Not for cryptography.
 */
export interface SeededRandom {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal (mean 0, SD 1). */
  normal(): number;
  /** Integer in [0, n). */
  int(n: number): number;
}

/**
 * Create a deterministic generator from a seed (any finite number; the low 32 bits are used).
 * @example const r = seededRandom(42); r.uniform(); // same sequence for the same seed
 */
export function seededRandom(seed: number): SeededRandom {
  if (!Number.isFinite(seed)) throw new Error("seededRandom requires a finite seed");
  let state = seed >>> 0;
  let spare: number | null = null;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u <= Number.EPSILON) u = uniform();
    const v = uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    spare = radius * Math.sin(2 * Math.PI * v);
    return radius * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal, int: (n: number) => Math.min(n - 1, Math.floor(uniform() * n)) };
}
