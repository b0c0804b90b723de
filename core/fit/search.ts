/**
 * One-dimensional minimisation for the fitter's time-constant search.
 *
 * Method: Brent's method (R. P. Brent, *Algorithms for Minimization without Derivatives*, 1973, ch. 5):
 * golden-section steps with parabolic interpolation through the three best points when it is safe, on a
 * bracket [a, b] known to hold the minimum. Converges to the minimum of the function itself (not of a
 * parabola through grid points), which matters: a parabola fitted to three points of a log-spaced grid is
 * biased by about 1 % in τ when the profile is not symmetric in log τ.
 */

export interface Minimum {
  x: number;
  fx: number;
  evaluations: number;
}

const GOLD = 0.381966011250105; // (3 − √5)/2

/**
 * Minimum of f on [a, b] to an absolute tolerance `tol` in x.
 * @param start a point inside the bracket where f is known to be low (e.g. the best grid point), with its value
 * @example brentMinimum((x) => (x - 2) ** 2, 0, 5, 1e-9).x // 2
 */
export function brentMinimum(f: (x: number) => number, a: number, b: number, tol: number, start?: { x: number; fx: number }, maxEvaluations = 60): Minimum {
  let x = start?.x ?? a + GOLD * (b - a);
  let fx = start?.fx ?? f(x);
  let evaluations = start ? 0 : 1;
  let w = x, v = x, fw = fx, fv = fx;
  let d = 0, e = 0;
  while (evaluations < maxEvaluations) {
    const m = 0.5 * (a + b);
    const tol1 = tol + 1e-12 * Math.abs(x);
    const tol2 = 2 * tol1;
    if (Math.abs(x - m) <= tol2 - 0.5 * (b - a)) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      // Parabola through x, w, v.
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
      if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < m ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = (x < m ? b : a) - x;
      d = GOLD * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = f(u);
    evaluations++;
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w; fv = fw;
      w = x; fw = fx;
      x = u; fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w; fv = fw;
        w = u; fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u; fv = fu;
      }
    }
  }
  return { x, fx, evaluations };
}
