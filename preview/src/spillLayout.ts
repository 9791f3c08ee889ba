/**
 * How big each ABTEST spill is, decided before the formula runs.
 *
 * HyperFormula fixes an array formula's size when the formula is entered (from the formula text, not from
 * cell values), and turns a result that is larger than the reserved size into an error. The custom-function
 * metadata does not say how large a spill will be, so the preview derives the layout rules from the function
 * catalogue's spill shapes (functions/catalogue.ts; docs/catalogue.md, "Spills follow the input"): only the
 * SHAPE of each result, never how it is computed. The reserved size is an upper bound: a smaller result
 * (blank "no variant" rows) leaves the rest of the block empty.
 */
import { CATALOGUE_LIST } from '../../functions/catalogue';
import type { SpillShape } from '../../functions/sheet/entry';
import { POINTS } from '../../functions/sheet/rules';
import type { FunctionMetadata } from './metadata';

/** The kinds of spill the catalogue has. */
export type SpillKind =
  /** one value per variant, along the input (a column input spills a column) */
  | 'perVariant'
  /** one block per variant of `width` values: rows for a column input, columns for a row input */
  | 'perVariantBlock'
  /** a fixed number of rows and columns (a fitted prior's alpha, beta) */
  | 'fixed'
  /** a chart table: `points` rows; a grid column plus one column per variant (or per challenger) */
  | 'densityTable'
  /** one row per row of the day table (the first range); one column per challenger, or one column */
  | 'byDay';

/** The layout rule of one function. */
export interface SpillRule {
  readonly kind: SpillKind;
  /** perVariantBlock: values per variant; fixed: columns. */
  readonly width?: number;
  /** fixed: rows. */
  readonly height?: number;
  /** densityTable: columns beyond the grid column, counted from the number of variants k (k or k − 1). */
  readonly seriesLessThanVariants?: number;
  /** byDay: one column per challenger (true) or a single column (false). */
  readonly perChallenger?: boolean;
}

/** The preview's layout rule for a catalogue spill shape; undefined for a single-cell result. */
export function spillRuleOf(shape: SpillShape): SpillRule | undefined {
  switch (shape.kind) {
    case 'one':
      return undefined;
    case 'perVariant':
      return shape.width === 1 ? { kind: 'perVariant' } : { kind: 'perVariantBlock', width: shape.width };
    case 'fixed':
      return { kind: 'fixed', height: shape.rows, width: shape.columns };
    case 'densityTable':
      return { kind: 'densityTable', seriesLessThanVariants: shape.series === 'variant' ? 0 : 1 };
    case 'byDay':
      return { kind: 'byDay', perChallenger: shape.per === 'challenger' };
  }
}

/** The layout rule of every catalogue function whose result is a matrix, by custom-function id. */
export const SPILL_RULES: Readonly<Record<string, SpillRule>> = Object.freeze(
  Object.fromEntries(
    CATALOGUE_LIST.flatMap((f) => {
      const rule = spillRuleOf(f.spill);
      return rule === undefined ? [] : [[f.id, rule] as const];
    }),
  ),
);

/** The catalogue's default number of rows of a chart table (`[points]`, default 101; sheet/rules.ts). */
export const DEFAULT_POINTS = POINTS.default;

/** A spill size in cells. */
export interface SpillSize {
  readonly rows: number;
  readonly columns: number;
}

/** What the layout needs to know about the formula's arguments, read from the formula text. */
export interface ArgumentShapes {
  /** rows × columns of the first matrix argument (the variants), or undefined when it is not a range. */
  readonly firstRange?: SpillSize;
  /** The literal number given for `points`, or undefined when absent or not a literal. */
  readonly points?: number;
}

/**
 * The cells to reserve for a matrix result of `fn`, from the shape of its arguments.
 *
 * A function without a rule (a new one not yet listed) gets the first range's size, and a larger result
 * becomes a clear error in the cell rather than a wrong layout. Cost: O(1). Never throws.
 *
 * @example
 * spillSize({ id: 'RATE_INTERVAL', name: 'RATE_INTERVAL', parameters: [] }, { firstRange: { rows: 3, columns: 1 } });
 * //=> { rows: 3, columns: 2 }
 */
export function spillSize(fn: FunctionMetadata, shapes: ArgumentShapes): SpillSize {
  const rule = SPILL_RULES[fn.id.toUpperCase()];
  const range = shapes.firstRange ?? { rows: 1, columns: 1 };
  const isRow = range.rows === 1 && range.columns > 1;
  const variants = range.rows * range.columns;
  if (rule === undefined) return range;
  switch (rule.kind) {
    case 'perVariant':
      return range;
    case 'perVariantBlock': {
      const width = rule.width ?? 1;
      return isRow ? { rows: width, columns: variants } : { rows: variants, columns: width };
    }
    case 'fixed':
      return { rows: rule.height ?? 1, columns: rule.width ?? 1 };
    case 'densityTable': {
      const points =
        shapes.points !== undefined && Number.isInteger(shapes.points) && shapes.points > 0
          ? shapes.points
          : DEFAULT_POINTS;
      return { rows: points, columns: 1 + Math.max(1, variants - (rule.seriesLessThanVariants ?? 0)) };
    }
    case 'byDay':
      // The day table is rows × columns (days × variants): a row per day, a column per challenger or one.
      return { rows: range.rows, columns: rule.perChallenger === true ? Math.max(1, range.columns - 1) : 1 };
  }
}
