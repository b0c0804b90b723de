/**
 * The true recovery after a night setback of a two-node zone, integrated here by classical RK4 at a
 * 10-second step from the truth's own parameters (tests/support/zone-sim.ts MassTruth; not
 * core/dynamics.ts): the air held at the occupied setpoint T1 long enough for the mass to settle at a
 * steady outdoor temperature, then free drift (equipment off, internal gain on) until the air reaches
 * the setback T0, then full heat until the air is back at T1. Returns the hours of that last stretch,
 * null when the drift never reaches T0 within two weeks or full heat never reaches T1 within four days.
 */
import type { MassTruth } from '../support/zone-sim.ts';

export function trueTwoNodeRecoveryHours(mass: MassTruth, heatRate: number, gain: number, T0: number, T1: number, outdoorC: number): number | null {
  const kam = 1 / mass.airMassHours;
  const kma = (kam * (1 - mass.massShare)) / mass.massShare;
  const kmo = 1 / mass.massOutdoorHours;
  const f = (T: number, m: number, q: number): [number, number] => [kam * (m - T) + q, kma * (T - m) + kmo * (outdoorC - m)];
  const h = 10 / 3600;
  const step = (s: { T: number; m: number }, q: number) => {
    const [a1, b1] = f(s.T, s.m, q);
    const [a2, b2] = f(s.T + (h / 2) * a1, s.m + (h / 2) * b1, q);
    const [a3, b3] = f(s.T + (h / 2) * a2, s.m + (h / 2) * b2, q);
    const [a4, b4] = f(s.T + h * a3, s.m + h * b3, q);
    s.T += (h / 6) * (a1 + 2 * a2 + 2 * a3 + a4);
    s.m += (h / 6) * (b1 + 2 * b2 + 2 * b3 + b4);
  };
  // Held at T1: the mass settles where its own balance is zero.
  const s = { T: T1, m: (kma * T1 + kmo * outdoorC) / (kma + kmo) };
  let t = 0;
  while (s.T > T0) {
    step(s, gain);
    t += h;
    if (t > 336) return null;
  }
  t = 0;
  let prev = s.T;
  while (s.T < T1) {
    prev = s.T;
    step(s, gain + heatRate);
    t += h;
    if (t > 96) return null;
  }
  // Linear interpolation inside the last step.
  return t - h + (h * (T1 - prev)) / (s.T - prev);
}
