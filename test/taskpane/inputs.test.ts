/**
 * Reading what people type into the panel: either decimal mark, digit groups as the language writes them
 * (the platform's CLDR data through Intl: "1.234,5" in German, "1 234,5" in French, "1'234.5" in Swiss
 * German, "12,34,567" in Indian English — common practice of those languages), percents in percent
 * fields with the likely slip named, and numbers shown back in the user's way.
 */
import {
  DEFAULT_LOCALE,
  formatCount,
  formatDecimal,
  formatPercent,
  localeOf,
  parseNumber,
  parsePercent,
  readCount,
  readNumber,
  readPercent,
  type PercentRule,
} from '../../taskpane/logic/inputs';

const de = localeOf('de-DE');
const fr = localeOf('fr-FR');
const ch = localeOf('de-CH');
const en = localeOf('en-US');

describe('localeOf', () => {
  test('decimal mark and group separator of a few languages', () => {
    expect(en).toEqual({ language: 'en-US', decimal: '.', group: ',' });
    expect(de).toEqual({ language: 'de-DE', decimal: ',', group: '.' });
    expect(fr.decimal).toBe(',');
    expect(ch).toEqual({ language: 'de-CH', decimal: '.', group: "'" });
    expect(localeOf(undefined)).toBe(DEFAULT_LOCALE);
    expect(localeOf('')).toBe(DEFAULT_LOCALE);
    expect(localeOf('not a language tag!')).toBe(DEFAULT_LOCALE);
  });
});

describe('readNumber: either decimal mark, unambiguously', () => {
  test.each([
    ['4,5', en, 4.5],
    ['4.5', de, 4.5],
    ['0,05', en, 0.05],
    ['.5', en, 0.5],
    ['-4,5', en, -4.5],
    ['12,000', en, 12000],
    ['12.000', de, 12000],
    ['1,234', de, 1.234],
    ['1.234', en, 1.234],
    ['1,234,567.5', en, 1234567.5],
    ['1.234.567,5', de, 1234567.5],
    ['12 000,5', fr, 12000.5],
    ['12\u202f000,5', fr, 12000.5],
    ["1'234.5", ch, 1234.5],
    ['12,34,567', localeOf('en-IN'), 1234567],
    ['1e-3', en, 0.001],
  ] as const)('%s in %s is %d', (text, locale, value) => {
    const reading = readNumber(text, locale);
    expect(reading.value).toBeCloseTo(value, 12);
    expect(reading.ambiguity).toBeNull();
  });

  test('a mark the language uses for neither decimals nor groups is read as thousands, and said so', () => {
    expect(readNumber('1.234', fr)).toEqual({
      value: 1234,
      ambiguity: '"1.234" is read as 1\u202f234 (thousands); if you meant a decimal, type 1,234',
    });
    expect(readNumber('1,234', ch).value).toBe(1234);
    expect(readNumber('1,234', ch).ambiguity).toContain('if you meant a decimal, type 1.234');
  });

  test.each(['', 'abc', '1,2,3', '1,23,4', '4,5,6.7', '1.2.3,4,5', '5%', '--4', '1 2'])(
    '"%s" is not a number',
    (text) => {
      expect(readNumber(text).value).toBeNaN();
    },
  );

  test('parseNumber and parsePercent keep their old meaning and take a decimal comma', () => {
    expect(parseNumber('12,000')).toBe(12000);
    expect(parseNumber(' 4.5% ')).toBeCloseTo(0.045, 15);
    expect(parseNumber('4,5')).toBe(4.5);
    expect(parsePercent('4')).toBe(0.04);
    expect(parsePercent('4%')).toBe(0.04);
    expect(parsePercent('4,5 %')).toBeCloseTo(0.045, 15);
    expect(parsePercent('abc')).toBeNaN();
  });
});

describe('readPercent: one unit, the likely slip named', () => {
  const threshold: PercentRule = {
    name: 'Decision threshold',
    min: 0.5,
    minIncluded: false,
    max: 1,
    maxIncluded: false,
    example: '95',
  };
  const rate: PercentRule = {
    name: 'Baseline conversion rate',
    min: 0,
    minIncluded: false,
    max: 1,
    maxIncluded: false,
    example: '4',
  };

  test('a percent is read as a fraction for the core', () => {
    expect(readPercent('95', threshold)).toEqual({ ok: true, value: 0.95, note: null });
    expect(readPercent('97,5 %', threshold, de)).toEqual({ ok: true, value: 0.975, note: null });
  });

  test('a fraction typed into a percent field: the message says what it meant and what to type', () => {
    expect(readPercent('0.95', threshold)).toEqual({
      ok: false,
      message:
        'Decision threshold: 0.95 here means 0.95%, because this field takes a percent. For 95% type 95, not 0.95.',
    });
    expect(readPercent('0,95', threshold, de)).toEqual({
      ok: false,
      message:
        'Decision threshold: 0,95 here means 0,95%, because this field takes a percent. For 95% type 95, not 0,95.',
    });
  });

  test('out of range, empty and not a number', () => {
    expect(readPercent('950', threshold)).toEqual({
      ok: false,
      message: 'Decision threshold: 950% is not possible; it must be above 50% and below 100%.',
    });
    expect(readPercent('40', threshold)).toEqual({
      ok: false,
      message: 'Decision threshold: it must be above 50% and below 100%; you typed 40%.',
    });
    expect(readPercent('', threshold)).toEqual({ ok: false, message: 'Decision threshold: type a percent, e.g. 95.' });
    expect(readPercent('high', threshold)).toEqual({
      ok: false,
      message: 'Decision threshold: "high" is not a number. Type a percent such as 95.',
    });
  });

  test('a small rate below 1 is allowed, with a note saying how it was read', () => {
    expect(readPercent('0.04', rate)).toEqual({
      ok: true,
      value: 0.0004,
      note: 'read as 0.04%; if you meant 4%, type 4.',
    });
    expect(readPercent('0.04%', rate)).toEqual({ ok: true, value: 0.0004, note: null });
  });
});

describe('readCount', () => {
  const visitors = {
    name: 'Visitors per day',
    min: 0,
    minIncluded: false,
    max: Number.POSITIVE_INFINITY,
    whole: false,
    example: '4000',
  };
  test('digit groups in the language, refusals in words', () => {
    expect(readCount('12.000', visitors, de)).toEqual({ ok: true, value: 12000, note: null });
    expect(readCount('0', visitors)).toEqual({
      ok: false,
      message: 'Visitors per day: it must be above 0; you typed 0.',
    });
    expect(readCount('40%', visitors)).toEqual({
      ok: false,
      message: 'Visitors per day: this field takes a plain number, not a percent (e.g. 4000).',
    });
    expect(readCount('', visitors)).toEqual({ ok: false, message: 'Visitors per day: type a number, e.g. 4000.' });
  });
});

describe("showing numbers in the user's way", () => {
  test('percents and counts', () => {
    expect(formatPercent(0.0412)).toBe('4.12%');
    expect(formatPercent(0.000123)).toBe('0.0123%');
    expect(formatPercent(0.045, de)).toBe('4,50%');
    expect(formatCount(31233.4)).toBe('31,233');
    expect(formatCount(31234, de)).toBe('31.234');
    expect(formatDecimal(4.5, de)).toBe('4,5');
    expect(formatDecimal(12000, de)).toBe('12000');
  });

  test('what the panel writes into a field reads back as the same number', () => {
    for (const locale of [en, de, fr, ch]) {
      for (const x of [0.5, 4.5, 192.123, 12000, 10412, 1234.5])
        expect(readNumber(formatDecimal(x, locale), locale).value).toBe(x);
    }
  });
});
