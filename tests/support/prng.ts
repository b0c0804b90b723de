/**
 * A small seeded pseudo-random generator for the reference simulator and the demo data.
 *
 * Method: mulberry32, a 32-bit state generator (one multiply-xorshift mix per draw) with a period of 2^32,
 * plenty for invented weather and log imperfections. Normal deviates by the Box–Muller transform (any
 * statistics text). Same seed, same sequence, on every platform: all arithmetic is 32-bit integer
 * (Math.imul) or IEEE double.
 *
 * @example const rnd = new Prng(7); rnd.next(); // a number in [0, 1)
 */
export class Prng {
  private state: number;
  private spare: number | null = null;

  /** @param seed any integer; it is folded to 32 bits. */
  constructor(seed: number) {
    this.state = (Math.trunc(seed) ^ 0x9e3779b9) >>> 0;
  }

  /** Uniform in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Uniform integer in [lo, hi] (both ends included). */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** Standard normal deviate (mean 0, standard deviation 1), Box–Muller. */
  normal(): number {
    if (this.spare !== null) {
      const s = this.spare;
      this.spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  }
}
