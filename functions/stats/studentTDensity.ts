/**
 * The Student t posterior of a mean written as a working density in u, with value
 * x = centre + scale·sinh(u). In u the heavy polynomial tails of the t (x^−(ν+1)) become exponential
 * (e^−ν|u|), the density is smooth and strictly log-concave for every ν ≥ 1 (the Cauchy included), and its
 * mode is u = 0. Every formula below is written in tanh u and sech² u so nothing overflows or cancels.
 */
import { ensure } from './errors';
import type { WorkingDensity } from './types';

const LN2 = Math.LN2;

/** log cosh u for any u, accurate near 0 (log1p(2 sinh²(u/2))) and for huge |u| (no overflow). */
function logCosh(u: number): number {
  const a = Math.abs(u);
  if (a < 20) {
    const s = Math.sinh(a / 2);
    return Math.log1p(2 * s * s);
  }
  return a - LN2 + Math.log1p(Math.exp(-2 * a));
}

/** log(1 + sinh²(u)/ν) for any u (no overflow of sinh² at |u| > 355). */
function log1pSinh2Over(u: number, nu: number): number {
  const a = Math.abs(u);
  if (a < 300) {
    const s = Math.sinh(a);
    return Math.log1p((s * s) / nu);
  }
  const logSinh = a - LN2 + Math.log1p(-Math.exp(-2 * a));
  // log(S² + ν) − log ν = 2 log S + log1p(ν/S²) − log ν; ν/S² underflows harmlessly.
  return 2 * logSinh + Math.log1p(nu * Math.exp(-2 * logSinh)) - Math.log(nu);
}

/** sech² u, underflowing to 0 for huge |u|. */
function sech2(u: number): number {
  const a = Math.abs(u);
  if (a > 300) return 4 * Math.exp(-2 * a);
  const c = Math.cosh(a);
  return 1 / (c * c);
}

/**
 * The Student t distribution with `df` degrees of freedom, location `centre` and scale `scale`, as a
 * WorkingDensity in u where the value is x = centre + scale·sinh(u).
 *
 * With t = (x − centre)/scale = sinh u the density in u is f_t(sinh u)·cosh u, so relative to its
 * maximum at u = 0
 *   log g(u) = −((ν+1)/2)·log1p(sinh²u/ν) + log cosh u,
 *   slope     = −tanh u·(1 + (ν−1)·tanh²u) / (ν·sech²u + tanh²u),
 *   curvature = sech²u·(ν + (ν−1)·tanh²u·(3ν + 1 − (ν−1)·tanh²u)) / (ν·sech²u + tanh²u)²,
 * derived by hand from the t density (standard; the posterior of a Normal mean under the reference prior
 * is this t with ν = n − 1, centre x̄, scale s/√n: Gelman et al., Bayesian Data Analysis, 3rd ed., §3.2).
 * At ν = 1 (Cauchy) these reduce to −log cosh u, −tanh u and sech²u. The curvature at the mode is 1/ν:
 * for large ν the density in u is flat-topped (≈ exp(−u⁴/4) near 0, the asinh of a near-normal), so a
 * width taken from the mode's curvature (the tabulation's `spread`) overstates the posterior's width by
 * √ν; compare posteriors by their `scale` instead.
 *
 * Cost: O(1) to build, O(1) per evaluation. Throws StatsError('invalid_argument') unless df ≥ 1,
 * centre is finite and scale > 0 is finite.
 * @example studentTWorkingDensity(1, 0, 1).logDensity(1) //=> -0.433780830483027 (−log cosh 1)
 * @example studentTWorkingDensity(9, 25, 2).toValue(Math.asinh(1)) //=> 27
 */
export function studentTWorkingDensity(df: number, centre: number, scale: number): WorkingDensity {
  ensure(Number.isFinite(df) && df >= 1, `degrees of freedom must be a finite number ≥ 1, got ${df}`);
  ensure(Number.isFinite(centre), `the centre must be a finite number, got ${centre}`);
  ensure(Number.isFinite(scale) && scale > 0, `the scale must be a finite number > 0, got ${scale}`);
  const nu = df;
  const half = (nu + 1) / 2;
  const density: WorkingDensity = {
    logDensity: (u: number): number => -half * log1pSinh2Over(u, nu) + logCosh(u),
    slope: (u: number): number => {
      const t = Math.tanh(u);
      const t2 = t * t;
      return (-t * (1 + (nu - 1) * t2)) / (nu * sech2(u) + t2);
    },
    curvature: (u: number): number => {
      const t2 = Math.tanh(u) ** 2;
      const h = sech2(u);
      const d = nu * h + t2;
      return (h * (nu + (nu - 1) * t2 * (3 * nu + 1 - (nu - 1) * t2))) / (d * d);
    },
    mode: 0,
    toValue: (u: number): number => centre + scale * Math.sinh(u),
    toWorking: (x: number): number => Math.asinh((x - centre) / scale),
    valueJacobian: (u: number): number => scale * Math.cosh(u),
    valueRange: [-Infinity, Infinity] as const,
  };
  // The mean of a t exists only for ν > 1 (a Cauchy has none).
  return nu > 1 ? { ...density, exactMean: centre } : density;
}
