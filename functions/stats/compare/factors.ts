/**
 * The factors of the comparison integrals ∫ f_base(x) · Π factors(x) dx (integrate.ts): what each factor
 * is (another posterior's cdf, survival function, density or integrated cdf at u = scale·x + shift), its
 * log at a point of the base, where it is largest on an interval (for the pruning bounds), where its own
 * panel edges fall inside a base panel (for the refinement), and the walk over the pieces a panel is cut
 * into.
 */
import type { TabulatedDistribution } from '../quadrature';

/**
 * A base panel is split at a factor's panel edges when at least this many of them fall inside it (the
 * factor's panels are then at most about a third as wide as the base's). Measured: splitting at every
 * factor edge instead changes P(highest) of 10 variants by ≤ 3e-11 relative (2e-15 absolute).
 */
const REFINE_EDGES = 3;

/**
 * What a factor contributes at a point u = scale·x + shift of its own value. The signed kinds serve a
 * ratio whose base may take either sign (ratio.ts SignedRatio): at base value x 'signedCdf' is the cdf at
 * u for x ≥ 0 and the survival function for x < 0 (P(Y ≤ kx) against P(Y ≥ kx)), 'signedSf' the other way
 * round.
 */
export type FactorKind = 'cdf' | 'sf' | 'density' | 'lowerMoment' | 'signedCdf' | 'signedSf';

/** The kinds that depend on the sign of the base's value (never evaluated directly in the working variable). */
function isSigned(kind: FactorKind): boolean {
  return kind === 'signedCdf' || kind === 'signedSf';
}

export interface Factor {
  readonly dist: TabulatedDistribution;
  readonly kind: FactorKind;
  readonly scale: number;
  readonly shift: number;
}

export function factor(dist: TabulatedDistribution, kind: FactorKind, scale = 1, shift = 0): Factor {
  return { dist, kind, scale, shift };
}

/** True when the factor can be evaluated at the base's working value directly (same coordinate, u = x). */
export function isDirect(base: TabulatedDistribution, f: Factor): boolean {
  if (isSigned(f.kind)) return false;
  return base.coordinate !== undefined && base.coordinate === f.dist.coordinate && f.scale === 1 && f.shift === 0;
}

/** log of the factor at the base point with working value z and value x. */
export function factorLog(f: Factor, direct: boolean, z: number, x: number): number {
  const d = f.dist;
  if (direct) {
    switch (f.kind) {
      case 'cdf':
        return d.logCdfAt(z);
      case 'sf':
        return d.logSfAt(z);
      case 'density':
        return d.logDensityAt(z) - Math.log(d.source.valueJacobian(z));
      case 'lowerMoment':
        return d.logLowerMomentAt(z);
      default:
        break;
    }
  }
  const u = f.scale * x + f.shift;
  switch (f.kind) {
    case 'cdf':
      return d.logCdf(u);
    case 'sf':
      return d.logSf(u);
    case 'density':
      return d.logValueDensity(u);
    case 'lowerMoment':
      return d.logLowerMoment(u);
    case 'signedCdf':
      return x >= 0 ? d.logCdf(u) : d.logSf(u);
    case 'signedSf':
      return x >= 0 ? d.logSf(u) : d.logCdf(u);
  }
}

/**
 * Where a factor is largest on [a, b]: 'right' or 'left' for the monotone kinds, 'ends' (the larger of the
 * two ends, or 1 on a panel that holds x = 0) for the signed tails, which are monotone on each side of
 * zero, and 'none' for densities (bounded by their largest value).
 */
export function boundSide(kind: FactorKind): 'left' | 'right' | 'ends' | 'none' {
  if (kind === 'signedCdf' || kind === 'signedSf') return 'ends';
  return kind === 'sf' ? 'left' : kind === 'density' ? 'none' : 'right';
}

/**
 * The factor's panel edges strictly inside the base interval [za, zb], mapped to the base's z; for the
 * signed kinds also the base's x = 0 when it lies inside (where they jump or bend).
 */
export function innerEdges(
  base: TabulatedDistribution,
  f: Factor,
  direct: boolean,
  za: number,
  zb: number,
  out: number[],
): void {
  const d = f.dist;
  if (isSigned(f.kind)) {
    const [lo, hi] = base.source.valueRange;
    if (lo < 0 && hi > 0) {
      const zero = base.source.toWorking(0);
      if (zero > za && zero < zb) out.push(zero);
    }
  }
  let fa: number;
  let fb: number;
  if (direct) {
    fa = za;
    fb = zb;
  } else {
    const [lo, hi] = d.source.valueRange;
    const ua = f.scale * base.source.toValue(za) + f.shift;
    const ub = f.scale * base.source.toValue(zb) + f.shift;
    fa = ua <= lo ? -Infinity : ua >= hi ? Infinity : d.source.toWorking(ua);
    fb = ub <= lo ? -Infinity : ub >= hi ? Infinity : d.source.toWorking(ub);
    // A negative scale maps the base interval backwards.
    if (fa > fb) [fa, fb] = [fb, fa];
  }
  const edges = d.edges;
  const last = edges.length - 1;
  if (fb <= (edges[0] as number) || fa >= (edges[last] as number)) return;
  // First edge index > fa.
  let first = fa < (edges[0] as number) ? 0 : d.findPanel(fa) + 1;
  // Last edge index < fb.
  let end = fb > (edges[last] as number) ? last : d.findPanel(fb);
  if ((edges[end] as number) >= fb) end -= 1;
  if (first <= last && (edges[first] as number) <= fa) first += 1;
  if (end - first + 1 < REFINE_EDGES) return;
  for (let i = first; i <= end; i++) {
    const e = edges[i] as number;
    if (direct) out.push(e);
    else {
      const x = (d.source.toValue(e) - f.shift) / f.scale;
      const [lo, hi] = base.source.valueRange;
      if (x > lo && x < hi) out.push(base.source.toWorking(x));
    }
  }
}

/** Offsets from a cusp (in the base's working variable), graded by 4 down to 4^-22 ≈ 2e-13: see shiftEdges. */
const CUSP_STEPS: readonly number[] = Array.from({ length: 23 }, (_, k) => 4 ** -k);
/** Offsets from a soft bend (in the base's working variable): see shiftEdges. */
const BEND_STEPS: readonly number[] = [1, 2, 4, 8, 16, 32, 64];

/**
 * Extra cuts for a shifted factor u = scale·x + shift (a difference) whose posterior starts at 0 and is
 * piled up against it (the slope of its log density in its working variable is below 1 at its window's
 * left end: a Beta or Gamma shape below 1), inside the base interval [za, zb]:
 *  - where u = 0 falls inside it (x0 = −shift/scale), the factor behaves like u^a with a < 1 on the side
 *    where u > 0 (a cusp no panel rule resolves): that side is graded towards x0's working value z0, cuts
 *    at z0 ± 4^-k for k = 0 … 22 (a leftover of 2e-13 of a working unit holds less than ~1e-13 of the
 *    panel's mass); each piece then starts at a quarter of its width from the cusp (~1e-15 for the
 *    16-point rule);
 *  - where u = 0 lies outside the base's values (x0 ≤ 0 for rates), the factor bends where x ≈ |x0| (its
 *    working value goes from log|shift| to log x): on a panel wider than 1, cuts at that point's working
 *    value ± 1, 2, 4 … 64.
 * Cost: at most 23 (or 15) cuts, in the one base panel holding the point; nothing for other factors.
 */
export function shiftEdges(
  base: TabulatedDistribution,
  f: Factor,
  direct: boolean,
  za: number,
  zb: number,
  out: number[],
): void {
  const d = f.dist;
  if (direct || f.shift === 0 || isSigned(f.kind) || d.source.valueRange[0] !== 0) return;
  if (!(d.source.slope(d.windowLeft) < 1)) return;
  const x0 = -f.shift / f.scale;
  const [lo, hi] = base.source.valueRange;
  if (x0 > lo && x0 < hi) {
    const z0 = base.source.toWorking(x0);
    if (!(z0 > za && z0 < zb)) return;
    out.push(z0);
    // u > 0 to the right of z0 when scale > 0 (toWorking increases), to the left otherwise.
    const side = f.scale > 0 ? 1 : -1;
    for (const step of CUSP_STEPS) {
      const z = z0 + side * step;
      if (z > za && z < zb) out.push(z);
    }
    return;
  }
  const bend = Math.abs(x0);
  if (!(zb - za > 1 && bend > lo && bend < hi)) return;
  const z1 = base.source.toWorking(bend);
  if (!(z1 > za - 64 && z1 < zb + 64)) return;
  if (z1 > za && z1 < zb) out.push(z1);
  for (const step of BEND_STEPS) {
    if (z1 - step > za && z1 - step < zb) out.push(z1 - step);
    if (z1 + step > za && z1 + step < zb) out.push(z1 + step);
  }
}

/** log of the integrand f_base · x^{withValue} · Π factors at one point. */
export function pointLog(
  base: TabulatedDistribution,
  factors: readonly Factor[],
  direct: readonly boolean[],
  withValue: boolean,
  needValue: boolean,
  z: number,
  logDensity: number,
  skip: Uint8Array,
): number {
  let v = logDensity;
  if (v === -Infinity) return v;
  const x = needValue ? base.source.toValue(z) : 0;
  if (withValue) v += Math.log(x);
  for (let i = 0; i < factors.length; i++) {
    if (skip[i] === 1) continue;
    v += factorLog(factors[i] as Factor, direct[i] as boolean, z, x);
    if (v === -Infinity) return v;
  }
  return v;
}

/**
 * Visits the pieces of the base panel [a, b] cut at `breaks` (sorted here, in place), left to right, as
 * (middle, half-width); pieces shorter than 1e-13 of their position are merged into the next.
 */
export function forEachPiece(a: number, b: number, breaks: number[], visit: (mid: number, half: number) => void): void {
  breaks.sort((u, v) => u - v);
  let left = a;
  for (let s = 0; s <= breaks.length; s++) {
    const right = s < breaks.length ? (breaks[s] as number) : b;
    if (!(right > left)) continue;
    if (right - left <= 1e-13 * Math.max(1, Math.abs(left)) && s < breaks.length) continue;
    visit((right + left) / 2, (right - left) / 2);
    left = right;
  }
}
