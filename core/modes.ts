/**
 * The zone model's dynamics in modal form, for one node (air only) or two nodes (air and building mass).
 *
 * Model (internal units: °C, hours, K/h). One node:
 *   dTi/dt = (T_out − Ti)/τ + q
 * Two nodes (air Ti and mass Tm, heat into the air; the continuous-time grey-box form "TiTe" of Bacher &
 * Madsen 2011, Energy and Buildings 43(7) 1511–1522):
 *   dTi/dt = k_am·(Tm − Ti) + q
 *   dTm/dt = k_ma·(Ti − Tm) + k_mo·(T_out − Tm)
 * with q = h·u_heat − c·u_cool + g + s·I (heating, cooling, internal gain, solar proxy) and
 *   k_am = 1/τam (τam = C_air·R_air–mass),  k_mo = 1/τmo (τmo = C_mass·R_mass–outdoor),
 *   k_ma = k_am·C_air/C_mass = k_am·(1 − share)/share,  share = C_mass/(C_air + C_mass).
 *
 * Method: the system matrix A = [[−k_am, k_am], [k_ma, −(k_ma + k_mo)]] has two real, negative, distinct
 * eigenvalues λ₁,₂ = T/2 ± √(T²/4 − det A) (T = trace A; det A = k_am·k_mo > 0 and the off-diagonal
 * product k_am·k_ma > 0 make the discriminant positive), so the state splits into two first-order modes,
 * each with its own time constant τ_m = −1/λ_m, and the air temperature is their sum:
 *   Ti = Σ w_m,   w_m' = (o_m·T_out − w_m)/τ_m + f_m·q.
 * Each mode is then stepped exactly by the one-node step (core/step.ts, FixedStep) with ambient o_m·T_out
 * and forcing f_m·q. With eigenvectors v_m = (1, r_m), r_m = 1 + λ_m/k_am (first row of (A − λI)v = 0):
 *   f₁ = r₂/(r₂ − r₁), f₂ = −r₁/(r₂ − r₁);  o₁ = −τ₁·k_mo/(r₂ − r₁), o₂ = τ₂·k_mo/(r₂ − r₁);
 * and the mass temperature is Tm = Σ r_m·w_m. Checks: Σ f_m = 1 (heat enters the air at rate q),
 * Σ o_m = 1 (at steady state the zone settles at the outdoor temperature without forcing), and
 * Σ τ_m·f_m = τ_eff = (k_ma + k_mo)/(k_am·k_mo) = τam + τmo·(1 − share)/share, the steady rise per K/h
 * of forcing (C_air·(R_air–mass + R_mass–outdoor)). One node is the same with one mode: o = f = 1, τ₁ = τ.
 *
 * Throws InputError for non-positive or non-finite parameters.
 * @example modesOf({ tauHours: 30 }).tau[0] // 30
 */
import { InputError } from './errors.ts';
import type { MassNode } from './types.ts';

export type { MassNode };

/** Modal form of a zone's dynamics: mode m has time constant tau[m], outdoor weight o[m], forcing weight f[m]. */
export interface Modes {
  count: number;
  tau: Float64Array;
  o: Float64Array;
  f: Float64Array;
  /** Mass temperature per unit of each mode's state (Tm = Σ r[m]·w[m]); empty for one node. */
  r: Float64Array;
  /** Steady rise of the air per K/h of forcing, hours: τ (one node) or C_air·R_total (two nodes). */
  tauEff: number;
  /**
   * Weight of the air in the mass's own balance, k_ma/(k_ma + k_mo): with no flow into or out of the
   * mass, Tm = mw·Ti + (1 − mw)·T_out (0 for one node).
   */
  mw: number;
}

/** The rates of a mass node, per hour. */
export function massRates(m: MassNode): { kam: number; kma: number; kmo: number } {
  const kam = 1 / m.airMassHours;
  return { kam, kma: (kam * (1 - m.massShare)) / m.massShare, kmo: 1 / m.massOutdoorHours };
}

/** Steady rise per K/h of forcing of a two-node zone, hours: (k_ma + k_mo)/(k_am·k_mo). */
export function effectiveTau(m: MassNode): number {
  const { kam, kma, kmo } = massRates(m);
  return (kma + kmo) / (kam * kmo);
}

function checkMass(m: MassNode): void {
  if (!(m.airMassHours > 0 && Number.isFinite(m.airMassHours))) throw new InputError(`The air–mass time constant must be a positive number of hours, got ${m.airMassHours}.`);
  if (!(m.massOutdoorHours > 0 && Number.isFinite(m.massOutdoorHours))) throw new InputError(`The mass–outdoor time constant must be a positive number of hours, got ${m.massOutdoorHours}.`);
  if (!(m.massShare > 0 && m.massShare < 1)) throw new InputError(`The mass share of the heat capacity must be between 0 and 1, got ${m.massShare}.`);
}

/**
 * The modes of a one-node model (`tauHours`) or, with `mass`, of a two-node model (its τ is then
 * C_air·R_total and follows from the mass node; `tauHours` is ignored).
 * @throws InputError for invalid parameters
 */
export function modesOf(model: { tauHours: number; mass?: MassNode | null }): Modes {
  const mass = model.mass;
  if (!mass) {
    if (!(model.tauHours > 0 && Number.isFinite(model.tauHours))) throw new InputError(`The zone's time constant τ must be a positive number of hours, got ${model.tauHours}.`);
    return { count: 1, tau: Float64Array.of(model.tauHours), o: Float64Array.of(1), f: Float64Array.of(1), r: new Float64Array(0), tauEff: model.tauHours, mw: 0 };
  }
  checkMass(mass);
  const { kam, kma, kmo } = massRates(mass);
  const trace = -(kam + kma + kmo);
  const det = kam * kmo;
  const half = trace / 2;
  // λ₁ (slow, nearer zero) and λ₂ (fast); the product form keeps λ₁ accurate when |λ₁| ≪ |λ₂|.
  const disc = Math.sqrt(Math.max(half * half - det, 0));
  const l2 = half - disc;
  const l1 = det / l2;
  const r1 = 1 + l1 / kam;
  const r2 = 1 + l2 / kam;
  const tau1 = -1 / l1;
  const tau2 = -1 / l2;
  const d = r2 - r1;
  return {
    count: 2,
    tau: Float64Array.of(tau1, tau2),
    o: Float64Array.of((-tau1 * kmo) / d, (tau2 * kmo) / d),
    f: Float64Array.of(r2 / d, -r1 / d),
    r: Float64Array.of(r1, r2),
    tauEff: (kma + kmo) / (kam * kmo),
    mw: kma / (kma + kmo),
  };
}

/** Modal states w (length modes.count) of the physical state air Ti and mass Tm (mass ignored for one node). */
export function modalState(modes: Modes, airC: number, massC: number, out: Float64Array = new Float64Array(modes.count)): Float64Array {
  if (modes.count === 1) {
    out[0] = airC;
    return out;
  }
  const [r1, r2] = modes.r;
  out[0] = (massC - r2 * airC) / (r1 - r2);
  out[1] = airC - out[0];
  return out;
}

/** The mass temperature of modal states w (NaN for one node). */
export function massOf(modes: Modes, w: ArrayLike<number>): number {
  if (modes.count === 1) return NaN;
  return modes.r[0] * w[0] + modes.r[1] * w[1];
}
