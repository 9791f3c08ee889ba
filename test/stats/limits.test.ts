import * as fs from 'fs';
import * as path from 'path';
import { conversion, eventRates, normalMeans } from '../../functions/stats';
import { MAX_COUNT, MAX_POINTS, MAX_VARIANTS, MIN_POINTS, checkLevel, checkPoints } from '../../functions/stats/limits';
import { POINTS } from '../../functions/sheet/rules';
import { COMPARISON, ONE_OR_MORE } from '../../functions/sheet/variants';
import { expectStatsErrorExact } from '../helpers/assertions';

/*
 * The limits of the core (functions/stats/limits.ts) and the places that state them: the sheet layer's
 * argument rules and the worksheet functions' help text (their JSDoc, which also feeds the help pages).
 * The numbers themselves are the function catalogue's (50 variants; counts up to 2^53, the largest whole
 * number a double holds exactly with all smaller ones, a fact of IEEE 754 doubles).
 */

const LEVEL_MESSAGE = (level: number): string =>
  `level: ${level} is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)`;

describe('the limits', () => {
  test('have the catalogue values', () => {
    expect(MAX_VARIANTS).toBe(50);
    expect(MAX_COUNT).toBe(9007199254740992);
    expect(MAX_COUNT + 1).toBe(MAX_COUNT); // the next whole number is not representable
    expect([MIN_POINTS, MAX_POINTS]).toEqual([2, 1000]);
  });

  test('the sheet rules take their bounds from limits.ts', () => {
    expect([POINTS.min, POINTS.max]).toEqual([MIN_POINTS, MAX_POINTS]);
    expect(ONE_OR_MORE.max).toBe(MAX_VARIANTS);
    expect(COMPARISON.max).toBe(MAX_VARIANTS);
  });

  test('every help text that states the points bound states limits.ts', () => {
    // The worksheet functions' JSDoc (functions/*.ts outside the core), however the files are split.
    const root = path.join(__dirname, '../../functions');
    const files: string[] = [];
    const walk = (dir: string): void => {
      for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
        const full = path.join(dir, entry.name);
        if (entry.isDirectory()) {
          if (full !== path.join(root, 'stats')) walk(full);
        } else if (entry.name.endsWith('.ts')) files.push(full);
      }
    };
    walk(root);
    const stated = files.flatMap((file) =>
      fs
        .readFileSync(file, 'utf8')
        .split('\n')
        .filter((line) => /@param \[?points\]?/.test(line))
        .map((line) => line.match(/(\d+) to (\d+)/)),
    );
    expect(stated.length).toBeGreaterThanOrEqual(2); // POSTERIOR_DENSITY and LIFT_DENSITY
    for (const bound of stated) expect([Number(bound?.[1]), Number(bound?.[2])]).toEqual([MIN_POINTS, MAX_POINTS]);
  });
});

describe('checkLevel and checkPoints', () => {
  test.each([0.5, 0.95, 1e-12, 1 - 1e-12])('level %p is accepted', (level) => {
    expect(() => checkLevel(level)).not.toThrow();
  });

  test.each([0, 1, -0.5, 1.5, NaN, Infinity])('level %p is refused in the one message style', (level) => {
    expectStatsErrorExact(() => checkLevel(level), 'invalid_argument', LEVEL_MESSAGE(level));
  });

  test('the three models refuse a level in the same words', () => {
    expectStatsErrorExact(
      () => conversion.rateInterval([{ conversions: 1, visitors: 10 }], 1),
      'invalid_argument',
      LEVEL_MESSAGE(1),
    );
    expectStatsErrorExact(
      () => normalMeans.meanInterval([{ count: 10, mean: 1, sd: 1 }], 0),
      'invalid_argument',
      LEVEL_MESSAGE(0),
    );
    expectStatsErrorExact(
      () => eventRates.eventsRateInterval([{ events: 1, exposure: 10 }], 2),
      'invalid_argument',
      LEVEL_MESSAGE(2),
    );
  });

  test.each([MIN_POINTS, 101, MAX_POINTS])('%p points are accepted', (points) => {
    expect(() => checkPoints(points)).not.toThrow();
  });

  test.each([1, MAX_POINTS + 1, 10000, 2.5, NaN])('%p points are refused', (points) => {
    expectStatsErrorExact(
      () => checkPoints(points),
      'invalid_argument',
      `points must be a whole number from 2 to 1000, not ${points}`,
    );
  });
});
