/** A seeded source of uniform numbers in [0, 1): the same seed gives the same recording on every machine. */
export type Uniform = () => number;

// mulberry32 (T. Ettinger, 2017, public domain): a 32-bit counter hashed by two multiply-xorshift rounds.
export function mulberry32(seed: number): Uniform {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates from a uniform source. */
export function gaussian(uniform: Uniform): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    // Box & Muller (1958), Ann. Math. Stat. 29:610-611: two uniforms give two independent normals.
    const u1 = 1 - uniform(); // in (0, 1], so the log is finite
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  };
}
