/**
 * Reading what people type into the panel's fields and showing numbers back in their own way of writing
 * them. The panel takes percents (type 5 for 5%); the worksheet functions take fractions (0.05): every
 * percent field says "%" and reads through `readPercent`, which names the likely slip when a value looks
 * like a fraction typed into a percent field. Either decimal mark is accepted ("4,5" and "4.5"); where
 * one text could mean two numbers ("1,234"), the user's Office language decides and the reading says so.
 * Pure functions.
 */

/** How a language writes numbers: its decimal mark and its digit-group separator. */
export interface NumberLocale {
  /** BCP 47 tag used for formatting ("en-US", "de-DE"). */
  readonly language: string;
  /** "." or "," (other marks are read as "."). */
  readonly decimal: '.' | ',';
  /** The group separator the language shows (",", ".", a space, "'"). */
  readonly group: string;
}

/** The panel's default when Office gives no language: US English. */
export const DEFAULT_LOCALE: NumberLocale = Object.freeze({ language: 'en-US', decimal: '.', group: ',' });

/**
 * The number conventions of a language tag (e.g. Office's `displayLanguage`), from the platform's Intl
 * data. Cost O(1). Unknown or empty tags give DEFAULT_LOCALE.
 * @example localeOf('de-DE') //=> { language: 'de-DE', decimal: ',', group: '.' }
 */
export function localeOf(language: string | undefined | null): NumberLocale {
  if (typeof language !== 'string' || language.trim() === '') return DEFAULT_LOCALE;
  try {
    const tag = Intl.NumberFormat.supportedLocalesOf([language.trim()])[0];
    if (tag === undefined) return DEFAULT_LOCALE;
    const parts = new Intl.NumberFormat(tag).formatToParts(1234567.5);
    const decimalMark = parts.find((part) => part.type === 'decimal')?.value ?? '.';
    const group = parts.find((part) => part.type === 'group')?.value ?? (decimalMark === ',' ? '.' : ',');
    return { language: tag, decimal: decimalMark === ',' ? ',' : '.', group };
  } catch {
    return DEFAULT_LOCALE;
  }
}

/** A number read from a field, with a note when the text could have meant another number. */
export interface NumberReading {
  /** NaN when the text is not a number. */
  readonly value: number;
  /** Set when "1,234"-like text used a mark the language uses for neither decimals nor groups: says how it was read. */
  readonly ambiguity: string | null;
}

const SPACES = /[\s\u00a0\u202f\u2009'\u2019]/g;

/** Digits grouped by a separator: a first group of 1–3 digits, then groups of 2 or 3 ending in 3 (1,234 or 12,34,567). */
function validGroups(groups: readonly string[]): boolean {
  if (groups.length < 2) return true;
  const [first, ...rest] = groups;
  if (first === undefined || !/^\d{1,3}$/.test(first)) return false;
  const last = rest[rest.length - 1] ?? '';
  return /^\d{3}$/.test(last) && rest.every((g) => /^\d{2,3}$/.test(g));
}

/**
 * Read a plain number as typed, in either decimal mark. Spaces, no-break spaces and apostrophes are digit
 * groups; with both "." and "," the last one is the decimal mark; one mark followed by other than three
 * digits is a decimal mark ("4,5", "0.05"); "1,234" and "1.234" are decided by `locale`: its decimal mark
 * makes a decimal, its group separator a group, any other mark a group with a note saying so. A trailing
 * "%" is not accepted here (see readPercent).
 * Cost O(length).
 * @example readNumber('4,5').value //=> 4.5; readNumber('12,000').value //=> 12000; readNumber('1.234', localeOf('de-DE')).value //=> 1234
 */
export function readNumber(text: string, locale: NumberLocale = DEFAULT_LOCALE): NumberReading {
  const none: NumberReading = { value: Number.NaN, ambiguity: null };
  let body = text.trim();
  let sign = '';
  if (/^[-+\u2212]/.test(body)) {
    sign = body.startsWith('+') ? '' : '-';
    body = body.slice(1).trimStart();
  }
  if (/^(\d+\.?\d*|\.\d+)[eE][-+]?\d+$/.test(body)) return { value: Number(sign + body), ambiguity: null };
  const spaced = body.split(SPACES).filter((part) => part !== '');
  if (spaced.length > 1 && !validGroups(spaced.map((part) => part.split(/[.,]/)[0] ?? ''))) return none;
  if (spaced.length > 1 && !spaced.slice(0, -1).every((part) => /^\d+$/.test(part))) return none;
  const compact = spaced.join('');
  if (!/^[\d.,]+$/.test(compact) || !/\d/.test(compact)) return none;
  const dots = compact.split('.').length - 1;
  const commas = compact.split(',').length - 1;
  const toNumber = (integerPart: string, fraction: string): number =>
    Number(`${sign}${integerPart || '0'}.${fraction || '0'}`);
  if (dots === 0 && commas === 0) return { value: Number(sign + compact), ambiguity: null };
  if (dots > 0 && commas > 0) {
    const decimalMark = compact.lastIndexOf('.') > compact.lastIndexOf(',') ? '.' : ',';
    const groupMark = decimalMark === '.' ? ',' : '.';
    if ((decimalMark === '.' ? dots : commas) !== 1) return none;
    const [whole = '', fraction = ''] = compact.split(decimalMark);
    if (!/^\d+$/.test(fraction) || !validGroups(whole.split(groupMark))) return none;
    return { value: toNumber(whole.split(groupMark).join(''), fraction), ambiguity: null };
  }
  const mark = dots > 0 ? '.' : ',';
  const pieces = compact.split(mark);
  if (pieces.length > 2) return validGroups(pieces) ? { value: Number(sign + pieces.join('')), ambiguity: null } : none;
  const [whole = '', fraction = ''] = pieces;
  if (!/^\d*$/.test(whole) || !/^\d+$/.test(fraction)) return none;
  const looksGrouped = fraction.length === 3 && /^[1-9]\d{0,2}$/.test(whole);
  if (!looksGrouped || mark === locale.decimal) return { value: toNumber(whole, fraction), ambiguity: null };
  const value = Number(sign + whole + fraction);
  if (mark === locale.group) return { value, ambiguity: null };
  // Neither the language's decimal mark nor its group separator: read as thousands, and say so.
  const shown = `${sign}${whole}${mark}${fraction}`;
  const other = `${sign}${whole}${locale.decimal}${fraction}`;
  return {
    value,
    ambiguity: `"${shown}" is read as ${formatCount(value, locale)} (thousands); if you meant a decimal, type ${other}`,
  };
}

/**
 * Parse a number as typed (see readNumber); a trailing "%" divides by 100. NaN for anything else.
 * Cost O(length).
 * @example parseNumber("12,000") //=> 12000; parseNumber("4.5%") //=> 0.045; parseNumber("4,5") //=> 4.5
 */
export function parseNumber(text: string, locale: NumberLocale = DEFAULT_LOCALE): number {
  const trimmed = text.trim();
  if (trimmed.endsWith('%')) return readNumber(trimmed.slice(0, -1), locale).value / 100;
  return readNumber(trimmed, locale).value;
}

/**
 * Parse a field labelled in percent: "4", "4%" and "4 %" all mean 0.04; "4,5" means 0.045.
 * Cost O(length). NaN when not a number.
 * @example parsePercent("4") //=> 0.04; parsePercent("4,5 %") //=> 0.045
 */
export function parsePercent(text: string, locale: NumberLocale = DEFAULT_LOCALE): number {
  return readNumber(text.trim().replace(/%$/, ''), locale).value / 100;
}

/** What one percent field accepts, as fractions, and what it is called. */
export interface PercentRule {
  /** The field's name as its label says it, in lower case after the first word ("Decision threshold"). */
  readonly name: string;
  /** Lowest accepted fraction and whether it is itself allowed. */
  readonly min: number;
  readonly minIncluded: boolean;
  /** Highest accepted fraction and whether it is itself allowed. */
  readonly max: number;
  readonly maxIncluded: boolean;
  /** An example of a sensible value, as a percent (for messages): "95". */
  readonly example: string;
}

/** What the panel learned from one field. */
export type FieldReading =
  | { readonly ok: true; readonly value: number; readonly note: string | null }
  | { readonly ok: false; readonly message: string };

/** "95%" for 0.95, with the language's decimal mark and no spurious digits. */
function percentWords(fraction: number, locale: NumberLocale): string {
  return `${formatDecimal(Number((fraction * 100).toPrecision(6)), locale)}%`;
}

/**
 * Read a percent field and check it against its rule. When the typed number is 1 or below but the
 * field's values are percents well above 1 (thresholds, power, levels), the message names the slip:
 * "0.95 here means 0.95%…". A small rate typed below 1 is accepted with a note saying how it was read.
 * Cost O(length).
 * @example readPercent('0,95', THRESHOLD_RULE) //=> { ok: false, message: 'Decision threshold: 0,95 here means 0.95% …' }
 */
export function readPercent(text: string, rule: PercentRule, locale: NumberLocale = DEFAULT_LOCALE): FieldReading {
  const typed = text.trim();
  if (typed === '') return { ok: false, message: `${rule.name}: type a percent, e.g. ${rule.example}.` };
  const withoutSign = typed.replace(/\s*%$/, '');
  const reading = readNumber(withoutSign, locale);
  const typedNumber = reading.value;
  if (!Number.isFinite(typedNumber)) {
    return { ok: false, message: `${rule.name}: "${typed}" is not a number. Type a percent such as ${rule.example}.` };
  }
  const value = typedNumber / 100;
  const low = rule.minIncluded ? value >= rule.min : value > rule.min;
  const high = rule.maxIncluded ? value <= rule.max : value < rule.max;
  const range =
    `${rule.minIncluded ? 'from' : 'above'} ${percentWords(rule.min, locale)} ` +
    `${rule.maxIncluded ? 'up to' : 'and below'} ${percentWords(rule.max, locale)}`;
  if (!low && typedNumber > 0 && typedNumber < 1 && rule.min >= 0.01) {
    return {
      ok: false,
      message:
        `${rule.name}: ${withoutSign} here means ${percentWords(value, locale)}, because this field takes a ` +
        `percent. For ${percentWords(typedNumber, locale)} type ` +
        `${formatDecimal(Number((typedNumber * 100).toPrecision(6)), locale)}, not ${withoutSign}.`,
    };
  }
  if (!high && typedNumber > 100 && rule.max <= 1) {
    return { ok: false, message: `${rule.name}: ${percentWords(value, locale)} is not possible; it must be ${range}.` };
  }
  if (!low || !high)
    return { ok: false, message: `${rule.name}: it must be ${range}; you typed ${percentWords(value, locale)}.` };
  const notes: string[] = [];
  if (reading.ambiguity !== null) notes.push(reading.ambiguity);
  if (typedNumber > 0 && typedNumber < 1 && !typed.endsWith('%')) {
    notes.push(
      `read as ${percentWords(value, locale)}; if you meant ${percentWords(typedNumber, locale)}, type ` +
        `${formatDecimal(Number((typedNumber * 100).toPrecision(6)), locale)}`,
    );
  }
  return { ok: true, value, note: notes.length > 0 ? `${notes.join('; ')}.` : null };
}

/** What a count or plain-number field accepts. */
export interface CountRule {
  readonly name: string;
  readonly min: number;
  readonly minIncluded: boolean;
  /** Upper limit (included); Infinity for none. */
  readonly max: number;
  /** Whole numbers only. */
  readonly whole: boolean;
  readonly example: string;
}

/**
 * Read a count or plain number field (visitors, variants, prior alpha) and check it against its rule.
 * A "%" typed into it is refused with a word on what the field takes. Cost O(length).
 * @example readCount('12,000', { name: 'Visitors per day', min: 0, minIncluded: false, max: Infinity, whole: false, example: '4000' }) //=> { ok: true, value: 12000, note: null }
 */
export function readCount(text: string, rule: CountRule, locale: NumberLocale = DEFAULT_LOCALE): FieldReading {
  const typed = text.trim();
  if (typed === '') return { ok: false, message: `${rule.name}: type a number, e.g. ${rule.example}.` };
  if (typed.endsWith('%')) {
    return {
      ok: false,
      message: `${rule.name}: this field takes a plain number, not a percent (e.g. ${rule.example}).`,
    };
  }
  const reading = readNumber(typed, locale);
  const value = reading.value;
  if (!Number.isFinite(value))
    return { ok: false, message: `${rule.name}: "${typed}" is not a number. Type a number such as ${rule.example}.` };
  if (rule.whole && !Number.isInteger(value)) {
    return {
      ok: false,
      message: `${rule.name}: it must be a whole number; you typed ${formatDecimal(value, locale)}.`,
    };
  }
  const low = rule.minIncluded ? value >= rule.min : value > rule.min;
  if (!low || value > rule.max) {
    const lowWords = `${rule.minIncluded ? 'at least' : 'above'} ${formatDecimal(rule.min, locale)}`;
    const words = Number.isFinite(rule.max)
      ? `${rule.minIncluded ? 'from' : 'above'} ${formatDecimal(rule.min, locale)} to ` +
        `${formatDecimal(rule.max, locale)}`
      : lowWords;
    return { ok: false, message: `${rule.name}: it must be ${words}; you typed ${formatDecimal(value, locale)}.` };
  }
  return { ok: true, value, note: reading.ambiguity === null ? null : `${reading.ambiguity}.` };
}

function formatter(locale: NumberLocale, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  return new Intl.NumberFormat(locale.language, { numberingSystem: 'latn', ...options } as Intl.NumberFormatOptions);
}

/**
 * A number with up to six significant digits in the language's way, without digit groups, for messages
 * and for text the panel puts into its own fields (so it reads back the same). Cost O(1).
 * @example formatDecimal(4.5, localeOf('de-DE')) //=> "4,5"; formatDecimal(12000) //=> "12000"
 */
export function formatDecimal(x: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  if (!Number.isFinite(x)) return '—';
  const text = String(Number(x.toPrecision(6)));
  if (/e/i.test(text)) return text;
  return locale.decimal === ',' ? text.replace('.', ',') : text;
}

/**
 * Show a fraction as a percentage with enough digits for small rates, in the language's way.
 * Cost O(1).
 * @example formatPercent(0.0412) //=> "4.12%"; formatPercent(0.000123) //=> "0.0123%"; formatPercent(0.045, localeOf('de-DE')) //=> "4,50%"
 */
export function formatPercent(fraction: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  if (!Number.isFinite(fraction)) return '—';
  const pct = fraction * 100;
  const abs = Math.abs(pct);
  const digits = abs === 0 ? 0 : abs >= 10 ? 1 : abs >= 1 ? 2 : Math.min(6, 1 - Math.floor(Math.log10(abs)) + 1);
  const text = formatter(locale, {
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
    useGrouping: false,
  }).format(pct);
  return `${text}%`;
}

/**
 * Show a count with the language's digit groups. Cost O(digits).
 * @example formatCount(31234) //=> "31,234"; formatCount(31234, localeOf('de-DE')) //=> "31.234"
 */
export function formatCount(n: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  return Number.isFinite(n) ? formatter(locale, { maximumFractionDigits: 0 }).format(Math.round(n)) : '—';
}
