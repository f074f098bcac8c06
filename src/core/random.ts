/**
 * Seeded pseudo-random numbers: every random choice in the planner takes a seed so that the same
 * request gives the same bytes. xoshiro128** (Blackman & Vigna 2018) seeded through splitmix32;
 * uniform doubles in [0, 1) from 53 random bits; standard normals by the Box–Muller transform.
 */
export class SeededRandom {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal: number | undefined;

  constructor(seed: number) {
    if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`);
    let x = (Math.trunc(seed) ^ 0x9e3779b9) >>> 0;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
  }

  /** Next 32 random bits as an unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform double in [0, 1). */
  uniform(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform integer in [0, n). */
  integer(n: number): number {
    return Math.floor(this.uniform() * n);
  }

  /** Standard normal deviate. */
  normal(): number {
    if (this.spareNormal !== undefined) {
      const v = this.spareNormal;
      this.spareNormal = undefined;
      return v;
    }
    let u = 0;
    while (u === 0) u = this.uniform();
    const v = this.uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spareNormal = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
