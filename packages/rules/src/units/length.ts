// Lengths as the shop records them: inches (often as fractions) or millimetres. A value keeps the unit it
// was measured in, because the codes give a limit in each system (1/8 in and 3 mm are not the same size)
// and a measurement is judged against the limit of its own system.
import { RulesInputError } from '../validation/rules-input-error.js';

export type LengthUnit = 'in' | 'mm';
export type Length = { value: number; unit: LengthUnit };
export type ParsedLength = Length & { mm: number; inches: number };

/** 1 in = 25.4 mm exactly (the international inch). */
export const MM_PER_INCH = 25.4;

export const toMm = (l: Length): number => (l.unit === 'mm' ? l.value : l.value * MM_PER_INCH);
export const toInches = (l: Length): number => (l.unit === 'in' ? l.value : l.value / MM_PER_INCH);
export const valueIn = (l: Length, unit: LengthUnit): number => (unit === 'mm' ? toMm(l) : toInches(l));
export const length = (value: number, unit: LengthUnit): Length => ({ value, unit });
export const inches = (value: number): Length => ({ value, unit: 'in' });
export const mm = (value: number): Length => ({ value, unit: 'mm' });

/** A size given by a code in one or both systems ('1/8 in (3 mm)'); a missing one is converted exactly. */
export type DualSize = { in?: number; mm?: number };

/** The value of a dual size in the given unit system: the code's own value there, else the conversion. */
export function limitIn(limit: DualSize, unit: LengthUnit): number {
  if (unit === 'in') return limit.in ?? (limit.mm ?? NaN) / MM_PER_INCH;
  return limit.mm ?? (limit.in ?? NaN) * MM_PER_INCH;
}

/** value > limit, with room for floating-point noise: sizes typed as 0.1 + 0.2 must not exceed 0.3. */
export const exceeds = (value: number, limit: number): boolean =>
  value > limit + 1e-9 * Math.max(1, Math.abs(limit));

/** The dual size as a Length in the given unit. */
export const dualAs = (limit: DualSize, unit: LengthUnit): Length => ({ value: limitIn(limit, unit), unit });

const UNIT_WORDS: Record<string, LengthUnit> = {
  '"': 'in',
  '″': 'in',
  in: 'in',
  'in.': 'in',
  inch: 'in',
  inches: 'in',
  mm: 'mm',
  millimetre: 'mm',
  millimetres: 'mm',
  millimeter: 'mm',
  millimeters: 'mm',
};

// whole-number-fraction ('1-1/4', '1 1/4'), fraction ('3/16'), or decimal ('0.125', '.5', '3')
const NUMBER = /^(?:(\d+)[\s-]+(\d+)\s*\/\s*(\d+)|(\d+)\s*\/\s*(\d+)|(\d+(?:\.\d*)?|\.\d+))\s*(.*)$/;

function fail(text: string, why: string): never {
  throw RulesInputError.field('length', `"${text}" is not a length: ${why}`);
}

/**
 * Read a length as typed in a form: '3/16', '3/16"', '1-1/4 in', '1 1/4 in', '0.125in', '3 mm', '3mm'.
 * Without a unit, `defaultUnit` applies (inches unless told). Throws a RangeError (RulesInputError)
 * with a plain message on empty, negative, zero-denominator or unreadable text.
 */
export function parseLength(text: string, defaultUnit: LengthUnit = 'in'): ParsedLength {
  const t = text.trim().toLowerCase();
  if (t === '') fail(text, 'it is empty');
  if (t.startsWith('-') || t.startsWith('−')) fail(text, 'a length cannot be negative');
  if (/^\d+,\d+/.test(t)) fail(text, 'use a point as the decimal separator (3.2 mm)');
  const m = NUMBER.exec(t);
  if (!m) fail(text, 'write it like 3/16, 1-1/4 in, 0.125 in or 3 mm');
  let value: number;
  if (m[1] !== undefined) {
    const den = Number(m[3]);
    if (den === 0) fail(text, 'the fraction has a zero denominator');
    value = Number(m[1]) + Number(m[2]) / den;
  } else if (m[4] !== undefined) {
    const den = Number(m[5]);
    if (den === 0) fail(text, 'the fraction has a zero denominator');
    value = Number(m[4]) / den;
  } else {
    value = Number(m[6]);
  }
  const word = (m[7] ?? '').trim();
  let unit: LengthUnit = defaultUnit;
  if (word !== '') {
    const u = UNIT_WORDS[word];
    if (!u) fail(text, `"${word}" is not a unit (use in or mm)`);
    unit = u;
  }
  if (!Number.isFinite(value)) fail(text, 'the number is too large');
  return unit === 'in'
    ? { value, unit, inches: value, mm: value * MM_PER_INCH }
    : { value, unit, mm: value, inches: value / MM_PER_INCH };
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** An inch value as a shop fraction ('3/16', '1-1/4') when it is an exact 64th, else null. */
export function inchFraction(value: number): string | null {
  const sixtyFourths = value * 64;
  if (!Number.isInteger(sixtyFourths) || sixtyFourths < 0) return null;
  const whole = Math.floor(sixtyFourths / 64);
  const rest = sixtyFourths % 64;
  if (rest === 0) return String(whole);
  const g = gcd(rest, 64);
  const frac = `${rest / g}/${64 / g}`;
  return whole === 0 ? frac : `${whole}-${frac}`;
}

// Plain decimal without exponent notation, shortest text that reads back to the same number.
function decimal(value: number, digits?: number): string {
  if (digits !== undefined) {
    const scale = 10 ** digits;
    return decimal(Math.round(value * scale) / scale);
  }
  const s = String(value);
  if (!s.includes('e')) return s;
  return value.toFixed(20).replace(/\.?0+$/, '');
}

export type FormatLengthOptions = {
  /** Round decimals to this many places (fractions of an inch are always shown exactly). */
  digits?: number;
  /** Show inch values as fractions when they are exact 64ths (default true). */
  fractions?: boolean;
};

/** '3/16 in', '1-1/4 in', '0.154 in', '3 mm', '3.2 mm'. parseLength reads every result back. */
// Texts already made, per unit and options: every range, limit and verdict formats a handful of sizes, and
// turning a double into its shortest decimal text is the dearest step of qualifiedRanges. Bounded: a
// table that grows past MAX_FORMATTED entries starts again.
const MAX_FORMATTED = 4096;
const formatted: Array<Map<number, string> | undefined> = [];

function formatUncached(l: Length, options: FormatLengthOptions): string {
  if (l.unit === 'in' && options.fractions !== false) {
    const f = inchFraction(l.value);
    if (f !== null) return `${f} in`;
  }
  return `${decimal(l.value, options.digits)} ${l.unit}`;
}

export function formatLength(l: Length, options: FormatLengthOptions = {}): string {
  const { digits } = options;
  if (digits !== undefined && !(Number.isInteger(digits) && digits >= 0 && digits <= 20))
    return formatUncached(l, options);
  const slot = (l.unit === 'in' ? 0 : 1) + (options.fractions === false ? 2 : 0) + 4 * (digits ?? 21);
  let table = formatted[slot];
  if (table === undefined) formatted[slot] = table = new Map();
  let text = table.get(l.value);
  if (text === undefined) {
    if (table.size >= MAX_FORMATTED) table.clear();
    text = formatUncached(l, options);
    table.set(l.value, text);
  }
  return text;
}

/** A length in the other unit, for showing both ('3/16 in (4.76 mm)'). */
export function formatLengthBoth(l: Length): string {
  const other: LengthUnit = l.unit === 'in' ? 'mm' : 'in';
  return `${formatLength(l)} (${formatLength({ value: valueIn(l, other), unit: other }, { digits: other === 'mm' ? 2 : 3, fractions: false })})`;
}
