/**
 * A cursor over the linear pieces of an outdoor profile (core/outdoor.ts); a constant outdoor
 * temperature is one piece from −∞ to +∞. Used by the recovery solvers to step exactly piece by piece.
 */
import { pieceIndex, type OutdoorProfile } from '../outdoor.ts';
import type { Outdoor } from './checks.ts';

/** Walks the pieces of a profile; a constant outdoor temperature is one piece from −∞ to +∞. */
export class Ambient {
  private readonly profile: OutdoorProfile;
  private readonly time: Float64Array;
  private readonly temp: Float64Array;
  private readonly n: number;
  k = 0;

  constructor(outdoor: Outdoor) {
    // A constant is one sample at −∞: pieceIndex then always finds piece 0, the last, constant one.
    this.profile = typeof outdoor === 'number' ? { time: Float64Array.of(-Infinity), temp: Float64Array.of(outdoor) } : outdoor;
    this.time = this.profile.time;
    this.temp = this.profile.temp;
    this.n = this.time.length;
  }

  seek(t: number): void {
    this.k = pieceIndex(this.profile, t);
  }

  /** End of the current piece (+∞ on the last). */
  end(): number {
    return this.k + 1 < this.n ? this.time[this.k + 1] : Infinity;
  }

  /** Slope of the current piece, K/h. */
  slope(): number {
    const k = this.k;
    if (k < 0 || k >= this.n - 1) return 0;
    return (this.temp[k + 1] - this.temp[k]) / (this.time[k + 1] - this.time[k]);
  }

  /** Outdoor temperature at t, which must lie in the current piece. */
  at(t: number): number {
    const k = this.k;
    if (k < 0) return this.temp[0];
    if (k >= this.n - 1) return this.temp[this.n - 1];
    return this.temp[k] + this.slope() * (t - this.time[k]);
  }

  /** Outdoor temperature after the last sample. */
  last(): number {
    return this.temp[this.n - 1];
  }

  next(): void {
    this.k++;
  }
}

