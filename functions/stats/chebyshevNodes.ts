/**
 * First-kind Chebyshev points and barycentric interpolation through them: the one home of the nodes the
 * piecewise working densities (chebyshevDensity.ts, at 24 and 12 points) and the lift chart's grid densities
 * (compare/ratioGrid.ts, at 16 points) interpolate on.
 */

/** The n points cos((2j + 1)π/(2n)) (descending in [−1, 1]), their angles and their barycentric weights. */
export interface ChebyshevNodes {
  readonly angles: readonly number[];
  readonly points: Float64Array;
  readonly weights: Float64Array;
}

/**
 * The first-kind Chebyshev points of order n with the barycentric weights (−1)^j sin((2j + 1)π/(2n))
 * (Berrut & Trefethen, "Barycentric Lagrange interpolation", SIAM Review 46, 2004, eq. 5.3). Cost O(n).
 * @example chebyshevNodes(2).points[0] //=> 0.7071067811865476
 */
export function chebyshevNodes(n: number): ChebyshevNodes {
  const angles = Array.from({ length: n }, (_, j) => ((2 * j + 1) * Math.PI) / (2 * n));
  return {
    angles,
    points: Float64Array.from(angles, (a) => Math.cos(a)),
    weights: Float64Array.from(angles, (a, j) => (j % 2 === 0 ? 1 : -1) * Math.sin(a)),
  };
}

/**
 * The polynomial through `values` at the nodes, evaluated at t ∈ [−1, 1] by the second barycentric formula
 * (exact at a node). Cost O(n).
 * @example barycentric(chebyshevNodes(3), Float64Array.of(2, 2, 2), 0.3) //=> 2
 */
export function barycentric(nodes: ChebyshevNodes, values: Float64Array, t: number): number {
  const { points, weights } = nodes;
  let numerator = 0;
  let denominator = 0;
  for (let j = 0; j < points.length; j++) {
    const d = t - (points[j] as number);
    if (d === 0) return values[j] as number;
    const w = (weights[j] as number) / d;
    numerator += w * (values[j] as number);
    denominator += w;
  }
  return numerator / denominator;
}
