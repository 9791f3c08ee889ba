/**
 * The integration machinery of every comparison: log ∫ f_base(x) · x^{withValue} · Π factors(x) dx over
 * the panels of a "base" posterior (logIntegral), and the tail and density integrals a quantile's Newton
 * step needs from one pass over the nodes (logTailAndDensity). Three rules keep them accurate:
 *  - both tails are kept: of a pair P(A), 1 − P(A) the smaller is integrated directly and the other is
 *    1 − smaller (LogTails, pairFromBoth), so a probability of 1e-30 is accurate relative to itself;
 *  - panels whose upper bound (panel mass × the factors' largest values on it, from their monotonicity)
 *    is below e^-46 of the running total are skipped — they cannot change the result; panels are visited
 *    by a first bound that counts the factors' windows (visitOrder), and the pieces of a split panel are
 *    bounded and skipped the same way, leaving out the tail factors that are 1 on them (PieceTail);
 *  - a base panel that holds two or more panels of a narrower factor is split at the factor's panel
 *    edges (factors.ts innerEdges), so a posterior of 1e9 visitors is resolved inside one of 100 visitors.
 * All of it is deterministic.
 */
import { StatsError } from '../errors';
import { log1mExp, logAddExp } from '../numeric';
import { PANEL_NODES, PANEL_ORDER, panelLogIntegral } from '../quadrature';
import type { TabulatedDistribution } from '../quadrature';
import { boundSide, factor, factorLog, forEachPiece, innerEdges, isDirect, pointLog, shiftEdges } from './factors';
import type { Factor } from './factors';

/** Panels whose bound lies this far (in log) below the running total are skipped (e^-46 ≈ 1e-20). */
export const PRUNE = 46;

/** A panel with `active` changing factors is split into ⌈√(1 + active)/SPLIT_SCALE⌉ equal parts. */
const SPLIT_SCALE = 3.2;

/**
 * log ∫ f_base(x) · x^{withValue} · Π factors(x) dx over the base's window (+ logOffset), with pruning and
 * refinement as described at the top of this file. The base's panels are visited by decreasing mass;
 * a panel is skipped when its bound (mass × the factors' largest values on it) is below e^-46 of the
 * running total, and the visit stops once even mass × the factors' global maxima is. Cost: two factor
 * evaluations per visited panel for the bound, then 16 per integrated (sub)panel and factor.
 */
export function logIntegral(
  base: TabulatedDistribution,
  factors: readonly Factor[],
  withValue = false,
  logOffset = 0,
): number {
  const n = PANEL_ORDER;
  const panels = base.panelCount;
  const count = factors.length;
  const direct = factors.map((f) => isDirect(base, f));
  const needValue = withValue || direct.some((d) => !d);
  const src = base.source;
  const sides = factors.map((f) => boundSide(f.kind));
  // Global maxima of the factors over the base's window (all ≤ 0 for cdf and sf, signed or not).
  let globalBound = withValue ? Math.log(src.toValue(base.windowRight)) : 0;
  factors.forEach((f, i) => {
    if (f.kind === 'density') globalBound += f.dist.logMaxValueDensity;
    else if (f.kind === 'lowerMoment') {
      const z = base.windowRight;
      globalBound += Math.max(0, factorLog(f, direct[i] as boolean, z, src.toValue(z)));
    }
  });
  const edgeCache = new Float64Array((panels + 1) * count).fill(NaN);
  const edgeFactor = (e: number, i: number): number => {
    const key = e * count + i;
    let v = edgeCache[key] as number;
    if (Number.isNaN(v)) {
      const z = base.edges[e] as number;
      v = factorLog(factors[i] as Factor, direct[i] as boolean, z, direct[i] ? 0 : src.toValue(z));
      edgeCache[key] = v;
    }
    return v;
  };

  // Only direct cdf and survival factors (P(highest), P(greater)): evaluated a panel's 16 nodes at a time
  // per factor (TabulatedDistribution.addLogTailsAt), the same sums in the same order as pointLog.
  const batched = !withValue && factors.every((f, i) => direct[i] && (f.kind === 'cdf' || f.kind === 'sf'));
  let total = -Infinity;
  const values = new Float64Array(n);
  const points = new Float64Array(n);
  const breaks: number[] = [];
  const skip = new Uint8Array(count);
  const pieceSkip = new Uint8Array(count);
  const mids: number[] = [];
  const halves: number[] = [];
  const tails = count >= 2 ? factors.map((f, i) => pieceTail(base, f, direct[i] as boolean)) : undefined;
  const { order, first } = visitOrder(base, tails);
  for (let r = 0; r < panels; r++) {
    const p = order[r] as number;
    const mass = base.panelLogMass[p] as number;
    if ((first[p] as number) + globalBound < total - PRUNE || mass === -Infinity) break;
    let bound = mass;
    for (let i = 0; i < count; i++) {
      const side = sides[i];
      if (side === 'left') bound += edgeFactor(p, i);
      else if (side === 'right') bound += edgeFactor(p + 1, i);
      else if (side === 'ends') {
        // A signed factor: monotone on each side of x = 0, so at most 1 on the panel holding zero.
        const zero = src.toValue(base.edges[p] as number) < 0 && src.toValue(base.edges[p + 1] as number) > 0;
        bound += zero ? 0 : Math.max(edgeFactor(p, i), edgeFactor(p + 1, i));
      } else bound += (factors[i] as Factor).dist.logMaxValueDensity;
    }
    if (withValue) bound += Math.log(src.toValue(base.edges[p + 1] as number));
    if (bound === -Infinity || bound < total - PRUNE) continue;
    const a = base.edges[p] as number;
    const b = base.edges[p + 1] as number;
    breaks.length = 0;
    for (let i = 0; i < count; i++) {
      innerEdges(base, factors[i] as Factor, direct[i] as boolean, a, b, breaks);
      shiftEdges(base, factors[i] as Factor, direct[i] as boolean, a, b, breaks);
    }
    // Many factors changing on this panel add their curvatures to the integrand's: with `active` of them
    // it is ~√(1 + active) times narrower than the base density, so split the panel into equal parts
    // keeping it within ~4.5 of its own standard deviations (measured: P(highest) of 50 close variants
    // then sums to 1 within 1e-13 before normalising, against 1e-8 unsplit).
    if (count >= 4) {
      let active = 0;
      for (let i = 0; i < count; i++) {
        if ((factors[i] as Factor).kind === 'density') active += 1;
        else if (Math.abs(edgeFactor(p + 1, i) - edgeFactor(p, i)) > 0.01) active += 1;
      }
      const parts = Math.ceil(Math.sqrt(1 + active) / SPLIT_SCALE);
      for (let j = 1; j < parts; j++) breaks.push(a + ((b - a) * j) / parts);
    }
    // A cdf or survival factor that is 1 to double precision on the whole panel (its smallest value, at
    // one edge, has log > −1e-18) is left out there: it cannot change the integrand.
    for (let i = 0; i < count; i++) {
      const side = sides[i];
      const least = side === 'right' ? edgeFactor(p, i) : side === 'left' ? edgeFactor(p + 1, i) : -Infinity;
      const kind = (factors[i] as Factor).kind;
      skip[i] = (kind === 'cdf' || kind === 'sf') && least > -1e-18 ? 1 : 0;
    }
    if (breaks.length === 0 && batched) {
      for (let k = 0; k < n; k++) values[k] = base.nodeLogDensity[p * n + k] as number;
      for (let i = 0; i < count; i++) {
        if (skip[i] === 1) continue;
        (factors[i] as Factor).dist.addLogTailsAt(base.nodeZ, p * n, n, values, (factors[i] as Factor).kind === 'sf');
      }
      total = logAddExp(total, panelLogIntegral(values, 0, (b - a) / 2));
      continue;
    }
    if (breaks.length === 0) {
      for (let k = 0; k < n; k++) {
        const z = base.nodeZ[p * n + k] as number;
        values[k] = pointLog(
          base,
          factors,
          direct,
          withValue,
          needValue,
          z,
          base.nodeLogDensity[p * n + k] as number,
          skip,
        );
      }
      total = logAddExp(total, panelLogIntegral(values, 0, (b - a) / 2));
      continue;
    }
    // Per piece: a tail factor that is 1 to double precision on the whole piece is left out (pieceSkip),
    // and a piece below some factor's window (its tail there ≤ its window's end value, ~e^-207) has a
    // bound that much lower; returns the piece's bound.
    const pieceBoundOf = (mid: number, half: number): number => {
      const left = mid - half;
      const right = mid + half;
      let pieceBound = bound;
      for (let i = 0; i < count; i++) {
        pieceSkip[i] = skip[i] as number;
        const t = tails === undefined ? undefined : tails[i];
        if (t === undefined || skip[i] === 1) continue;
        if (t.upper ? right <= t.one : left >= t.one) pieceSkip[i] = 1;
        else if (t.upper ? left >= t.windowEnd : right <= t.windowEnd) {
          // The panel's bound holds this factor's largest value on the panel; the piece's is at most `beyond`.
          pieceBound += Math.min(0, t.beyond - edgeFactor(t.upper ? p : p + 1, i));
        }
      }
      return pieceBound;
    };
    // The pieces by decreasing bound (ties left to right), each skipped like a panel when its bound falls
    // e^-46 below the running total: the pieces that hold the integral come first.
    mids.length = 0;
    halves.length = 0;
    forEachPiece(a, b, breaks, (mid, half) => {
      mids.push(mid);
      halves.push(half);
    });
    const pieceOrder = mids.map((_, s) => s);
    if (tails !== undefined) {
      const pieceBounds = mids.map((mid, s) => pieceBoundOf(mid, halves[s] as number));
      pieceOrder.sort((u, v) => {
        const bu = pieceBounds[u] as number;
        const bv = pieceBounds[v] as number;
        return bu > bv ? -1 : bu < bv ? 1 : u - v;
      });
    }
    for (const s of pieceOrder) {
      const mid = mids[s] as number;
      const half = halves[s] as number;
      if (tails !== undefined && pieceBoundOf(mid, half) < total - PRUNE) continue;
      const use = tails !== undefined ? pieceSkip : skip;
      if (batched) {
        for (let k = 0; k < n; k++) {
          const z = mid + half * (PANEL_NODES[k] as number);
          points[k] = z;
          values[k] = base.logDensityAt(z);
        }
        for (let i = 0; i < count; i++) {
          if (use[i] === 1) continue;
          (factors[i] as Factor).dist.addLogTailsAt(points, 0, n, values, (factors[i] as Factor).kind === 'sf');
        }
      } else {
        for (let k = 0; k < n; k++) {
          const z = mid + half * (PANEL_NODES[k] as number);
          values[k] = pointLog(base, factors, direct, withValue, needValue, z, base.logDensityAt(z), use);
        }
      }
      total = logAddExp(total, panelLogIntegral(values, 0, half));
    }
  }
  return total + logOffset;
}

/**
 * Where a direct cdf (or survival) factor is 1 to double precision and what it is at most beyond the
 * other end of its window, for the per-piece skipping of logIntegral: the cdf is taken as 1 from `one`
 * on, the first of its panel edges with 1 − F < 1e-18 (so log F > −1e-18, the panel rule's threshold;
 * the survival function mirrored), and below its window's left end (`windowEnd`) it is at most its value
 * there (`beyond`, the window's tail mass, ~e^-207).
 */
interface PieceTail {
  readonly upper: boolean;
  readonly one: number;
  readonly windowEnd: number;
  readonly beyond: number;
}

const ONE_LOG_TAIL = Math.log(1e-18);
const pieceTailCache = new WeakMap<TabulatedDistribution, { cdf: PieceTail; sf: PieceTail }>();

/**
 * The factor's PieceTail in the base's working coordinate: its own for a direct factor, else its two
 * points mapped through x = (u − shift)/scale (toValue and toWorking are increasing; scale > 0 only).
 */
function pieceTail(base: TabulatedDistribution, f: Factor, direct: boolean): PieceTail | undefined {
  if (f.kind !== 'cdf' && f.kind !== 'sf') return undefined;
  const own = ownPieceTail(f);
  if (direct) return own;
  if (!(f.scale > 0)) return undefined;
  const [lo, hi] = base.source.valueRange;
  const toBase = (z: number): number => {
    if (z === Infinity || z === -Infinity) return z;
    const x = (f.dist.source.toValue(z) - f.shift) / f.scale;
    return x <= lo ? -Infinity : x >= hi ? Infinity : base.source.toWorking(x);
  };
  return { upper: own.upper, one: toBase(own.one), windowEnd: toBase(own.windowEnd), beyond: own.beyond };
}

function ownPieceTail(f: Factor): PieceTail {
  const d = f.dist;
  let known = pieceTailCache.get(d);
  if (known === undefined) {
    const last = d.edges.length - 1;
    // The smallest edge with log(1 − F) < log 1e-18 (edgeLogSf decreases), and mirrored for F.
    let cdfOne = Infinity;
    for (let e = 0; e <= last; e++) {
      if ((d.edgeLogSf[e] as number) < ONE_LOG_TAIL) {
        cdfOne = d.edges[e] as number;
        break;
      }
    }
    let sfOne = -Infinity;
    for (let e = last; e >= 0; e--) {
      if ((d.edgeLogCdf[e] as number) < ONE_LOG_TAIL) {
        sfOne = d.edges[e] as number;
        break;
      }
    }
    known = {
      cdf: { upper: false, one: cdfOne, windowEnd: d.windowLeft, beyond: Math.min(0, d.edgeLogCdf[0] as number) },
      sf: { upper: true, one: sfOne, windowEnd: d.windowRight, beyond: Math.min(0, d.edgeLogSf[last] as number) },
    };
    pieceTailCache.set(d, known);
  }
  return f.kind === 'cdf' ? known.cdf : known.sf;
}

/**
 * The order logIntegral visits the base's panels in, and a first bound for each (log of the panel's mass
 * times what its direct tail factors are at most there, before the factors' global maxima): by decreasing
 * mass, unless some panel lies wholly beyond a factor's window (that factor's tail is ≤ ~e^-207 there),
 * then by decreasing first bound (ties in mass order), so the panels that hold the integral come first and
 * the pruning skips the rest. Cost: O(panels × factors) comparisons, plus a sort when reordered.
 */
function visitOrder(
  base: TabulatedDistribution,
  tails: readonly (PieceTail | undefined)[] | undefined,
): { order: ArrayLike<number>; first: Float64Array } {
  const panels = base.panelCount;
  const first = Float64Array.from(base.panelLogMass);
  if (tails === undefined) return { order: base.panelOrder, first };
  let reordered = false;
  for (let p = 0; p < panels; p++) {
    const a = base.edges[p] as number;
    const b = base.edges[p + 1] as number;
    for (const t of tails) {
      if (t !== undefined && (t.upper ? a >= t.windowEnd : b <= t.windowEnd) && t.beyond < 0) {
        first[p] = (first[p] as number) + t.beyond;
        reordered = true;
      }
    }
  }
  if (!reordered) return { order: base.panelOrder, first };
  // Array.prototype.sort is stable, so equal bounds keep the mass order.
  const order = Array.from(base.panelOrder).sort((u, v) => {
    const fu = first[u] as number;
    const fv = first[v] as number;
    return fu > fv ? -1 : fu < fv ? 1 : 0;
  });
  return { order, first };
}

/** A tail integral and the matching density integral, from one pass over the base's nodes. */
export interface TailAndDensity {
  /** log ∫ f_base(x) T(scale·x + shift) dx, T the other's cdf or survival function (or their signed kinds). */
  readonly logTail: number;
  /** log ∫ f_base(x) · x^{withValue} · f_other(scale·x + shift) dx (|x| with the signed kinds). */
  readonly logDensity: number;
}

/**
 * The two integrals a Newton step of a quantile needs (the tail and its derivative), with the mapped
 * point, its panel and the factor found once per node for both: the same panels, pruning (a panel is kept
 * while either integrand's bound is within e^-46 of its running total) and refinement as logIntegral. The
 * base's values and their logs come from its node caches, the other's log Jacobian from the value where
 * its density offers that. Same values as the two separate integrals to ~1e-15 relative. With a signed
 * tail kind (a base that may be negative, for ratio.ts SignedRatio) the tail switches between the
 * cdf and the survival function at x = 0, where the panel is split, the density carries |x| when
 * withValue, and a panel's tail bound is the larger end (1 on the panel holding zero).
 * Cost: about 1.2 times one logIntegral instead of 2.
 */
export function logTailAndDensity(
  base: TabulatedDistribution,
  other: TabulatedDistribution,
  tailKind: 'cdf' | 'sf' | 'signedCdf' | 'signedSf',
  scale: number,
  shift: number,
  withValue: boolean,
): TailAndDensity {
  const n = PANEL_ORDER;
  const panels = base.panelCount;
  const tailFactor = factor(other, tailKind, scale, shift);
  const direct = isDirect(base, tailFactor);
  const src = base.source;
  const os = other.source;
  const [lo, hi] = os.valueRange;
  const maxDensity = other.logMaxValueDensity;
  const signed = tailKind === 'signedCdf' || tailKind === 'signedSf';
  // x^{withValue} is at most its value at the right end (|x| at the farther end when signed).
  const logValueBound = (zLeft: number, zRight: number): number => {
    if (!signed) return Math.log(src.toValue(zRight));
    return Math.log(Math.max(Math.abs(src.toValue(zLeft)), Math.abs(src.toValue(zRight))));
  };
  const densityBound = (zLeft: number, zRight: number): number =>
    maxDensity + (withValue ? logValueBound(zLeft, zRight) : 0);
  const globalDensity = densityBound(base.windowLeft, base.windowRight);
  // The tail factor's log at a base edge (monotone in x: largest at the right edge for a cdf, left for sf;
  // signed: monotone on each side of x = 0, largest at one end or, on a panel holding zero, at most 1).
  const edgeTail = (z: number): number => factorLog(tailFactor, direct, z, direct ? 0 : src.toValue(z));
  const tailBoundOf = (za: number, zb: number): number => {
    if (!signed) return edgeTail(tailKind === 'cdf' ? zb : za);
    return src.toValue(za) < 0 && src.toValue(zb) > 0 ? 0 : Math.max(edgeTail(za), edgeTail(zb));
  };
  // Signed: the cdf is taken where x ≥ 0 for 'signedCdf' and where x < 0 for 'signedSf'.
  const cdfWhereNonNegative = tailKind === 'signedCdf';
  const tailValues = new Float64Array(n);
  const densityValues = new Float64Array(n);
  const breaks: number[] = [];
  let tail = -Infinity;
  let density = -Infinity;
  const upperTail = tailKind === 'sf';
  const nodeValue = direct && !withValue ? base.nodeZ : base.nodeValue;
  const nodeLogValue = withValue ? base.nodeLogValue : base.nodeZ;
  // Both integrands at the 16 points mid + half·t_k (base log density from the node table when given).
  const fill = (mid: number, half: number, nodeOffset: number): void => {
    const fromTable = nodeOffset >= 0;
    for (let k = 0; k < n; k++) {
      const z = fromTable ? (base.nodeZ[nodeOffset + k] as number) : mid + half * (PANEL_NODES[k] as number);
      const f = fromTable ? (base.nodeLogDensity[nodeOffset + k] as number) : base.logDensityAt(z);
      if (f === -Infinity) {
        tailValues[k] = -Infinity;
        densityValues[k] = -Infinity;
        continue;
      }
      const x = direct && !withValue ? 0 : fromTable ? (nodeValue[nodeOffset + k] as number) : src.toValue(z);
      const cdfHere = signed ? x >= 0 === cdfWhereNonNegative : !upperTail;
      let zu: number;
      let logJacobian: number;
      if (direct) {
        zu = z;
        logJacobian = Math.log(os.valueJacobian(zu));
      } else {
        const u = scale * x + shift;
        if (u <= lo || u >= hi) {
          const below = u <= lo;
          tailValues[k] = f + (cdfHere === below ? -Infinity : 0);
          densityValues[k] = -Infinity;
          continue;
        }
        zu = os.toWorking(u);
        logJacobian = os.logJacobianAtValue !== undefined ? os.logJacobianAtValue(u) : Math.log(os.valueJacobian(zu));
      }
      tailValues[k] = f + (cdfHere ? other.logCdfAt(zu) : other.logSfAt(zu));
      let logX = 0;
      if (withValue)
        logX = signed ? Math.log(Math.abs(x)) : fromTable ? (nodeLogValue[nodeOffset + k] as number) : Math.log(x);
      densityValues[k] = f + other.logDensityAt(zu) - logJacobian + logX;
    }
  };
  const order = base.panelOrder;
  for (let r = 0; r < panels; r++) {
    const p = order[r] as number;
    const mass = base.panelLogMass[p] as number;
    if (mass === -Infinity || (mass < tail - PRUNE && mass + globalDensity < density - PRUNE)) break;
    const a = base.edges[p] as number;
    const b = base.edges[p + 1] as number;
    const tailBound = mass + tailBoundOf(a, b);
    const needTail = tailBound !== -Infinity && tailBound >= tail - PRUNE;
    const needDensity = mass + densityBound(a, b) >= density - PRUNE;
    if (!needTail && !needDensity) continue;
    breaks.length = 0;
    innerEdges(base, tailFactor, direct, a, b, breaks);
    shiftEdges(base, tailFactor, direct, a, b, breaks);
    if (breaks.length === 0) {
      fill(0, 0, p * n);
      const half = (b - a) / 2;
      tail = logAddExp(tail, panelLogIntegral(tailValues, 0, half));
      density = logAddExp(density, panelLogIntegral(densityValues, 0, half));
      continue;
    }
    forEachPiece(a, b, breaks, (mid, half) => {
      fill(mid, half, -1);
      tail = logAddExp(tail, panelLogIntegral(tailValues, 0, half));
      density = logAddExp(density, panelLogIntegral(densityValues, 0, half));
    });
  }
  return { logTail: tail, logDensity: density };
}

/** The complementary pair log P(A), log P(not A): the smaller computed, the larger as log1mExp(smaller). */
export interface LogTails {
  readonly lower: number;
  readonly upper: number;
}

export function pairFromBoth(logA: number, logB: number): LogTails {
  return logA <= logB ? { lower: logA, upper: log1mExp(logA) } : { lower: log1mExp(logB), upper: logB };
}

/** True when x should be the base of a comparison of x and y (the narrower; ties broken symmetrically). */
export function xIsBase(x: TabulatedDistribution, y: TabulatedDistribution): boolean {
  if (x.spread !== y.spread) return x.spread < y.spread;
  if (x.mean !== y.mean) return x.mean < y.mean;
  return x.logNormaliser <= y.logNormaliser;
}

/** Throws StatsError('invalid_argument') for an empty list of distributions. */
export function checkList(ds: readonly TabulatedDistribution[]): void {
  if (ds.length < 1) throw new StatsError('invalid_argument', 'at least one distribution is needed');
}
