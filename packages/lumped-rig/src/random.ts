/**
 * A seeded pseudo-random source: every draw of the rig goes through one of these, so that a corpus is a pure
 * function of its seed (the platform's own generator is never used).
 */
export interface Random {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Uniform on [low, high). */
  between(low: number, high: number): number;
  /** Log-uniform on [low, high): equal odds per decade, for scale parameters (noise levels, masses). */
  logBetween(low: number, high: number): number;
  /** A whole number in [low, high] inclusive. */
  integer(low: number, high: number): number;
  /** Standard normal N(0, 1). */
  normal(): number;
  pick<T>(items: readonly T[]): T;
  /** An independent stream for a named part of the work, so that adding a draw in one part moves no other. */
  fork(label: string | number): Random;
}

// splitmix32 step (a 32-bit variant of Steele, Lea & Flood 2014, OOPSLA "Fast splittable pseudorandom number
// generators"), used to spread a seed over the generator's state; constants from memory of the usual finaliser.
function splitmix32(state: number): [number, number] {
  const next = (state + 0x9e3779b9) | 0;
  let z = next;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  z ^= z >>> 16;
  return [next, z >>> 0];
}

/** FNV-1a 32-bit hash of a text (Fowler, Noll & Vo; offset basis and prime from memory), to name forked streams. */
export function hashText(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/**
 * sfc32, Chris Doty-Humphrey's "small fast chaotic" generator (PractRand suite), seeded through splitmix32.
 * Period at least 2^32, passes PractRand to many terabytes (from memory); far more than a corpus draws.
 */
export function createRandom(seed: number): Random {
  if (!Number.isFinite(seed)) throw new RangeError(`seed (${seed}) must be a finite number`);
  let s = Math.trunc(seed) | 0;
  const words: number[] = [];
  for (let i = 0; i < 4; i++) {
    const [next, out] = splitmix32(s);
    s = next;
    words.push(out);
  }
  let [a, b, c, d] = words as [number, number, number, number];
  const next32 = (): number => {
    a |= 0; b |= 0; c |= 0; d |= 0;
    const t = (((a + b) | 0) + d) | 0;
    d = (d + 1) | 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) | 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) | 0;
    return t >>> 0;
  };
  for (let i = 0; i < 12; i++) next32();
  let spareNormal: number | null = null;

  const random: Random = {
    uniform: () => next32() / 4294967296,
    between: (low, high) => low + (high - low) * random.uniform(),
    logBetween: (low, high) => {
      if (!(low > 0 && high >= low)) throw new RangeError(`logBetween needs 0 < low <= high (got ${low}, ${high})`);
      return low * Math.exp(Math.log(high / low) * random.uniform());
    },
    integer: (low, high) => low + Math.floor((high - low + 1) * random.uniform()),
    normal: () => {
      if (spareNormal !== null) {
        const z = spareNormal;
        spareNormal = null;
        return z;
      }
      // Box & Muller (1958), Ann. Math. Statist. 29:610-611: two uniforms to two independent normals.
      let u = 0;
      while (u === 0) u = random.uniform();
      const v = random.uniform();
      const r = Math.sqrt(-2 * Math.log(u));
      spareNormal = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    pick: (items) => {
      if (items.length === 0) throw new RangeError('pick needs a non-empty list');
      return items[Math.floor(items.length * random.uniform())]!;
    },
    fork: (label) => createRandom((next32() ^ hashText(String(label))) | 0),
  };
  return random;
}

/** The seed of a named sub-stream of a seed, without drawing from any stream (stable as the corpus grows). */
export function deriveSeed(seed: number, label: string | number): number {
  const [, out] = splitmix32((Math.trunc(seed) ^ hashText(String(label))) | 0);
  return out | 0;
}
