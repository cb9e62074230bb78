/**
 * mulberry32: a small seeded 32-bit generator (public-domain algorithm by T. Ettinger), uniform
 * in [0, 1). The same seed gives the same numbers on every machine; used for invented data only
 * (demo campaign, fixtures, synthetic test sets, benchmark inputs), never for secrets.
 */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
