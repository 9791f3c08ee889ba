/**
 * Integration inside one panel, given the log of the integrand at the panel's 16 nodes: the whole
 * panel ({@link panelLogIntegral}) and the partial integrals from each edge to every node (the one kernel
 * {@link inPanelSums}, with {@link inPanelLogPartials} its logs for the integrated cdf). Each takes the
 * panel's exponential trend β out first and applies the trend-weighted rules of panelRule.ts, which
 * integrate poly(15)·e^{βt} exactly: accurate to ~1e-15 relative where plain Gauss–Legendre would lose
 * digits on a panel across which the integrand changes by e^{±20}.
 */
import { MAX_TREND, PANEL_NODES, PANEL_ORDER, TREND_LEFT, TREND_RIGHT, TREND_WHOLE } from './panelRule';

/** The panel's exponential trend: the nearest whole β to the slope of logValues in t ∈ [−1, 1]. */
function panelTrend(logValues: ArrayLike<number>, offset: number): number {
  const n = PANEL_ORDER;
  const first = logValues[offset] as number;
  const last = logValues[offset + n - 1] as number;
  if (!Number.isFinite(first) || !Number.isFinite(last)) return 0;
  const beta = Math.round((last - first) / ((PANEL_NODES[n - 1] as number) - (PANEL_NODES[0] as number)));
  return Math.max(-MAX_TREND, Math.min(MAX_TREND, beta));
}

/**
 * log ∫ over one panel of exp(v(t)), given v at the panel's 16 nodes (logValues[offset … offset+15]) and
 * the panel's half-width, by the trend-weighted rule ∫ ℓ_j(t) e^{βt} dt.
 * Cost: 16 exp and one log. Returns −Infinity when every value is −Infinity.
 * @example panelLogIntegral(new Float64Array(16), 0, 1) //=> 0.69314718055994… (log ∫_{−1}^{1} 1 dt = log 2)
 */
export function panelLogIntegral(logValues: ArrayLike<number>, offset: number, half: number): number {
  const n = PANEL_ORDER;
  let max = -Infinity;
  for (let j = 0; j < n; j++) {
    const v = logValues[offset + j] as number;
    if (v > max) max = v;
  }
  if (max === -Infinity) return -Infinity;
  const beta = panelTrend(logValues, offset);
  const nodes = PANEL_NODES;
  const w = TREND_WHOLE[beta + MAX_TREND] as Float64Array;
  let sum = 0;
  for (let j = 0; j < n; j++) {
    sum += (w[j] as number) * Math.exp((logValues[offset + j] as number) - max - beta * (nodes[j] as number));
  }
  return sum > 0 ? max + Math.log(half * sum) : -Infinity;
}

/**
 * The in-panel integration kernel: the partial integrals of exp(logValues) over one panel from its left
 * edge to each node (out `left`) and from each node to its right edge (out `right`), as multiples of
 * e^{returned value}, with the panel's trend removed. On return `scratch` holds the detrended values
 * h_j = exp(v_j − max − β t_j) the sums were formed from (for {@link inPanelLogPartials}). Returns
 * −Infinity (and zeros) when every value is −Infinity. Cost: 16 exp, one log and 2 × 256 multiply-adds.
 * @example
 * const left = new Float64Array(16);
 * inPanelSums(new Float64Array(16), 0, 1, left, new Float64Array(16), new Float64Array(16)) //=> 0 (log 1)
 * left[15] //=> 1.98940093499164… (∫ 1 dt from −1 to the last node, 1 + t_15 = 1.9894009349916499)
 */
export function inPanelSums(
  logValues: ArrayLike<number>,
  offset: number,
  half: number,
  left: Float64Array,
  right: Float64Array,
  scratch: Float64Array,
): number {
  const n = PANEL_ORDER;
  const nodes = PANEL_NODES;
  let max = -Infinity;
  for (let j = 0; j < n; j++) {
    const v = logValues[offset + j] as number;
    if (v > max) max = v;
  }
  if (max === -Infinity) {
    left.fill(0);
    right.fill(0);
    return -Infinity;
  }
  const beta = panelTrend(logValues, offset);
  const h = scratch;
  for (let j = 0; j < n; j++) h[j] = Math.exp((logValues[offset + j] as number) - max - beta * (nodes[j] as number));
  const lm = TREND_LEFT[beta + MAX_TREND] as Float64Array;
  const rm = TREND_RIGHT[beta + MAX_TREND] as Float64Array;
  for (let k = 0; k < n; k++) {
    let sl = 0;
    let sr = 0;
    for (let j = 0; j < n; j++) {
      const hj = h[j] as number;
      sl += (lm[n * k + j] as number) * hj;
      sr += (rm[n * k + j] as number) * hj;
    }
    left[k] = sl;
    right[k] = sr;
  }
  return max + Math.log(half);
}

/**
 * The logs of {@link inPanelSums}: log of the partial integrals from the left edge to each node (out
 * `left`) and from each node to the right edge (out `right`), each accurate relative to itself; returns
 * the log of the whole panel's integral (−Infinity, and −Infinity everywhere, when every value is
 * −Infinity). Cost: the kernel's plus 32 logs.
 * @example
 * const [left, right, scratch] = [new Float64Array(16), new Float64Array(16), new Float64Array(16)];
 * inPanelLogPartials(new Float64Array(16), 0, 1, left, right, scratch) //=> 0.69314718055994… (log 2)
 */
export function inPanelLogPartials(
  logValues: ArrayLike<number>,
  offset: number,
  half: number,
  left: Float64Array,
  right: Float64Array,
  scratch: Float64Array,
): number {
  const logScale = inPanelSums(logValues, offset, half, left, right, scratch);
  if (logScale === -Infinity) {
    left.fill(-Infinity);
    right.fill(-Infinity);
    return -Infinity;
  }
  const n = PANEL_ORDER;
  const wm = TREND_WHOLE[panelTrend(logValues, offset) + MAX_TREND] as Float64Array;
  let total = 0;
  for (let k = 0; k < n; k++) {
    total += (wm[k] as number) * (scratch[k] as number);
    const sl = left[k] as number;
    const sr = right[k] as number;
    left[k] = sl > 0 ? logScale + Math.log(sl) : -Infinity;
    right[k] = sr > 0 ? logScale + Math.log(sr) : -Infinity;
  }
  return total > 0 ? logScale + Math.log(total) : -Infinity;
}

/**
 * log(e^edge + e^logScale · partial), given scale = e^{logScale − edge} (+Infinity when edge is −Infinity
 * or far below): the edge's log plus log1p of the ratio while that is at most 1, else the partial's log
 * plus log1p of the inverse ratio; the edge alone when the partial is 0. Turns an edge's log F and the
 * kernel's partial sums into log F at a node without forming F.
 * @example addPartial(Math.log(0.5), 0.5, Math.log(0.25), 1) //=> -0.2876820724517809 (log(0.5 + 0.25) = log 0.75)
 */
export function addPartial(edge: number, scale: number, logScale: number, partial: number): number {
  if (!(partial > 0)) return edge;
  const ratio = partial * scale;
  if (ratio <= 1) return edge + Math.log1p(ratio);
  return logScale + Math.log(partial) + Math.log1p(1 / ratio);
}
