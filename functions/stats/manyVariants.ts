/**
 * Many variants against one control: the P(beats control) threshold that keeps the chance of any false
 * declaration at a chosen rate when several challengers are each compared with the same control.
 *
 * With m challengers, each read out by "P(beats control) ≥ threshold", and no true difference anywhere,
 * the chance that at least one is declared is far above the chance for one comparison (about 1 − (1 − α)^m
 * for unrelated comparisons; a little less here because all share the control). In the large-sample limit
 * P(beats control) = Φ(Z_i) with Z_i = (Y_i − Y_0)/√2 for independent standard normal Y_0 (the control)
 * and Y_1 … Y_m (the challengers, equal sizes), so the Z_i are equicorrelated normals with correlation ½:
 * Dunnett's one-sided many-to-one comparison (C. W. Dunnett, "A multiple comparison procedure for comparing
 * several treatments with a control", JASA 50, 1955) with infinite degrees of freedom.
 */
import { ensure } from './errors';
import { findRoot, gaussLegendre } from './numeric';
import { normalCdf, normalQuantile } from './special/normal';

/** Most variants (control included) the catalogue's comparisons accept. */
export const MAX_THRESHOLD_VARIANTS = 50;

const GL16 = gaussLegendre(16);
const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/**
 * P(max_i Z_i ≥ c) for m equicorrelated (ρ = ½) standard normals:
 * ∫ φ(y) [1 − Φ(y + c√2)^m] dy, the bracket formed as −expm1(m·log1p(−Φ(−y − c√2))) so that small
 * probabilities keep their digits. 16-point Gauss–Legendre panels of width ½ over y in [−10, 10] (φ(10) ≈
 * 8e-23): error below 1e-14 (checked against scipy.integrate.quad in test/stats/manyVariants.test.ts).
 */
export function anyAbove(c: number, m: number): number {
  let sum = 0;
  const shift = c * Math.SQRT2;
  for (let panel = 0; panel < 40; panel++) {
    const centre = -10 + 0.5 * panel + 0.25;
    for (let i = 0; i < 16; i++) {
      const y = centre + 0.25 * (GL16.nodes[i] as number);
      const upper = normalCdf(-(y + shift));
      const bracket = upper >= 1 ? 1 : -Math.expm1(m * Math.log1p(-upper));
      sum += (GL16.weights[i] as number) * INV_SQRT_2PI * Math.exp(-0.5 * y * y) * bracket;
    }
  }
  return Math.min(Math.max(0.25 * sum, 0), 1);
}

/**
 * The P(beats control) threshold each of `variants − 1` challengers must reach so that, with no true
 * difference, the chance of declaring any of them is `falseAlarm`: Φ(c) with P(max_i Z_i ≥ c) = falseAlarm
 * for equicorrelated normals Z_i (ρ = ½), i.e. Dunnett's (1955) one-sided many-to-one critical value with
 * infinite degrees of freedom, equal sizes. For 2 variants it is 1 − falseAlarm.
 *
 * Method: Brent's method on c with {@link anyAbove}; c to ~1e-12. Large-sample limit: with few visitors
 * or very unequal traffic the true rate differs (the read-out's P is not exactly Φ of a normal statistic).
 * Cost: ~20 evaluations of a 640-point quadrature: well under a millisecond.
 * Throws StatsError('invalid_argument') unless variants is a whole number from 2 to 50 and falseAlarm is
 * in [1e-6, 0.5].
 * @example thresholdForVariants(3) //=> 0.97233… (c = 1.9163; Dunnett 1955, 2 treatments, infinite df: 1.92)
 */
export function thresholdForVariants(variants: number, falseAlarm = 0.05): number {
  ensure(
    typeof variants === 'number' && Number.isInteger(variants) && variants >= 2 && variants <= MAX_THRESHOLD_VARIANTS,
    `the variants must be a whole number from 2 to ${MAX_THRESHOLD_VARIANTS} (the control and its challengers), got ${String(variants)}`,
  );
  ensure(
    typeof falseAlarm === 'number' && falseAlarm >= 1e-6 && falseAlarm <= 0.5,
    `the false-alarm rate must be between 1e-6 and 0.5, got ${String(falseAlarm)}`,
  );
  return normalCdf(dunnettCritical(variants - 1, falseAlarm));
}

/** Dunnett's one-sided critical value c for m challengers at level alpha (infinite degrees of freedom). */
export function dunnettCritical(m: number, alpha: number): number {
  const single = -normalQuantile(alpha);
  if (m === 1) return single;
  // c lies between the single-comparison value and the Bonferroni value −Φ⁻¹(α/m).
  const bonferroni = -normalQuantile(alpha / m);
  return findRoot((c) => anyAbove(c, m) - alpha, single, bonferroni + 1e-9, 1e-13);
}
