// The ranges a paper WPQ states, read as the trade writes them, set against the ranges the rules compute
// from the same coupon: where they differ, both are kept and the QA manager settles the difference —
// either the computed ranges stand, or the qualification is narrowed to what both allow (never widened
// beyond the rules: a paper record cannot grant more than its coupon qualifies).
import { parseLength, toMm, type Length } from '../units/length.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { weldingPositions, type WeldingPosition } from './positions.js';
import type { QualifiedRanges } from './qualified-ranges.js';
import type { Interval } from './size-ranges.js';

/** The paper record's statements, as written in the file (empty: the record says nothing of it). */
export type StatedRanges = {
  groovePositions?: string;
  filletPositions?: string;
  thickness?: string;
  diameter?: string;
  fNumbers?: string;
};
export const statedRangeVariables = ['groovePositions', 'filletPositions', 'thickness', 'diameter', 'fNumbers'] as const;
export type StatedRangeVariable = (typeof statedRangeVariables)[number];
export const statedRangeLabels: Record<StatedRangeVariable, string> = {
  groovePositions: 'Groove positions',
  filletPositions: 'Fillet positions',
  thickness: 'Thickness',
  diameter: 'Pipe diameter',
  fNumbers: 'F-No.',
};

export type RangeDifference = {
  variable: StatedRangeVariable;
  label: string;
  computed: string;
  stated: string;
};

const fail = (variable: StatedRangeVariable, message: string): never => {
  throw RulesInputError.field(variable, message);
};

/** 'F, H, V', 'F/H', '1G 2G' are not positions: 'all', 'F H V O', 'flat, horizontal'. */
export function parsePositions(text: string, variable: StatedRangeVariable = 'groovePositions'): WeldingPosition[] {
  const t = text.trim().toLowerCase();
  if (t === 'all' || t === 'all positions') return [...weldingPositions];
  if (t === 'none' || t === '-' || t === 'n/a') return [];
  const words: Record<string, WeldingPosition> = {
    f: 'F', flat: 'F', h: 'H', horizontal: 'H', v: 'V', vertical: 'V', o: 'O', overhead: 'O', oh: 'O',
  };
  const out = new Set<WeldingPosition>();
  for (const part of t.split(/[\s,;/&+]+|\band\b/).filter(Boolean)) {
    const p = words[part];
    if (!p) fail(variable, `“${text}” is not a list of positions: write F, H, V, O (or all)`);
    out.add(p!);
  }
  return weldingPositions.filter((p) => out.has(p));
}

const NO_LIMIT = /^(unlimited|no limit|any|all|max(imum)? to be welded|n\/a)$/;

/**
 * A stated size range: '1/8 to 3/4 in', '3/16 in - 1-1/4 in', 'up to 3/4', 'max 19 mm', '2-7/8 in and over',
 * '≥ 1 in', 'min 1 in', 'unlimited'. The unit of the last number applies to a bare first one.
 */
export function parseStatedInterval(text: string, variable: StatedRangeVariable): { min: Length | null; max: Length | null } {
  const t = text.trim().toLowerCase().replace(/["”″]/g, ' in').replace(/\s+/g, ' ').replace(/\s?od$/, '').trim();
  if (NO_LIMIT.test(t)) return { min: null, max: null };
  const len = (s: string, unit?: 'in' | 'mm'): Length => {
    try {
      const p = parseLength(s.trim(), unit);
      return { value: p.value, unit: p.unit };
    } catch {
      return fail(variable, `“${text}” is not a size range: write it like 1/8 to 3/4 in, up to 3/4 in, 2-7/8 in and over`);
    }
  };
  let m = /^(?:up to|max(?:imum)?\.?|≤|<=)\s*(.+)$/.exec(t);
  if (m) return { min: null, max: len(m[1]!) };
  m = /^(.+?)\s*(?:and (?:over|above|larger|up)|min(?:imum)?\.?|\+|or more|and greater)$/.exec(t);
  if (m) return { min: len(m[1]!), max: null };
  m = /^(?:min(?:imum)?\.?|≥|>=|over)\s*(.+)$/.exec(t);
  if (m) return { min: len(m[1]!), max: null };
  m = /^(.+?)\s*(?:to|–|—|-(?!\d+\/)|through|thru)\s*(.+)$/.exec(t);
  if (m) {
    const max = len(m[2]!);
    if (NO_LIMIT.test(m[2]!.trim())) return { min: len(m[1]!), max: null };
    const first = m[1]!.trim();
    const min = len(first, /[a-z]$/.test(first) ? undefined : max.unit);
    return { min: min.value === 0 ? null : min, max };
  }
  return fail(variable, `“${text}” is not a size range: write it like 1/8 to 3/4 in, up to 3/4 in, 2-7/8 in and over`);
}

/** 'F-No. 1-4', 'F4, F3', '1,2,3,4', '4 and below' (with 1 as the lowest). */
export function parseFNumbers(text: string): number[] {
  const t = text.trim().toLowerCase().replace(/f-?no\.?|f(?=\d)/g, ' ');
  const out = new Set<number>();
  const below = /^\s*(\d+)\s*(?:and (?:below|lower|under)|or lower)\s*$/.exec(t);
  if (below) {
    for (let n = 1; n <= Number(below[1]); n++) out.add(n);
    return [...out];
  }
  for (const part of t.split(/[\s,;/&]+|\band\b/).filter(Boolean)) {
    const r = /^(\d+)(?:-|–|to)(\d+)$/.exec(part);
    if (r) {
      for (let n = Number(r[1]); n <= Number(r[2]); n++) out.add(n);
    } else if (/^\d+$/.test(part)) out.add(Number(part));
    else fail('fNumbers', `“${text}” is not a list of F-Nos.: write it like 1-4 or F4, F3`);
  }
  return [...out].sort((a, b) => a - b);
}

// Paper records round: 3/4 in is written 19 mm, 2t of 0.375 in as 0.75 in — within 2 % or 0.5 mm is the same.
const sameLength = (a: Length | null, b: Length | null): boolean =>
  a === null || b === null ? a === b : Math.abs(toMm(a) - toMm(b)) <= Math.max(0.5, 0.02 * Math.max(toMm(a), toMm(b)));

const lengthText = (l: Length) => `${Number(l.value.toFixed(3))} ${l.unit}`;
export function intervalText(i: { min: Length | null; max: Length | null }): string {
  if (!i.min && !i.max) return 'no limit';
  if (!i.min) return `up to ${lengthText(i.max!)}`;
  if (!i.max) return `${lengthText(i.min)} and over`;
  return `${lengthText(i.min)} to ${lengthText(i.max)}`;
}
const positionsText = (p: WeldingPosition[]) => (p.length ? p.join(', ') : 'none');
const fText = (f: number[]) => (f.length ? f.join(', ') : 'none');
const sameSet = <T>(a: T[], b: T[]) => a.length === b.length && a.every((x) => b.includes(x));

/** Parses every stated variable; throws RulesInputError naming the first unreadable one. */
export function parseStatedRanges(stated: StatedRanges) {
  const has = (k: StatedRangeVariable) => (stated[k] ?? '').trim() !== '';
  return {
    groovePositions: has('groovePositions') ? parsePositions(stated.groovePositions!, 'groovePositions') : null,
    filletPositions: has('filletPositions') ? parsePositions(stated.filletPositions!, 'filletPositions') : null,
    thickness: has('thickness') ? parseStatedInterval(stated.thickness!, 'thickness') : null,
    diameter: has('diameter') ? parseStatedInterval(stated.diameter!, 'diameter') : null,
    fNumbers: has('fNumbers') ? parseFNumbers(stated.fNumbers!) : null,
  };
}

/** Where the paper record states something other than the rules compute (a silent variable is no difference). */
export function rangeDifferences(computed: QualifiedRanges, stated: StatedRanges): RangeDifference[] {
  const p = parseStatedRanges(stated);
  const out: RangeDifference[] = [];
  const add = (variable: StatedRangeVariable, c: string) =>
    out.push({ variable, label: statedRangeLabels[variable], computed: c, stated: stated[variable]!.trim() });
  if (p.groovePositions && !sameSet(p.groovePositions, computed.positions.groove))
    add('groovePositions', positionsText(computed.positions.groove));
  if (p.filletPositions && !sameSet(p.filletPositions, computed.positions.fillet))
    add('filletPositions', positionsText(computed.positions.fillet));
  for (const k of ['thickness', 'diameter'] as const) {
    const s = p[k];
    if (s && !(sameLength(s.min, computed[k].min) && sameLength(s.max, computed[k].max))) add(k, intervalText(computed[k]));
  }
  if (p.fNumbers && !computed.fNumbersAny && !sameSet(p.fNumbers, computed.fNumbers)) add('fNumbers', fText(computed.fNumbers));
  return out;
}

const larger = (a: Length | null, b: Length | null) => (a === null ? b : b === null ? a : toMm(a) >= toMm(b) ? a : b);
const smaller = (a: Length | null, b: Length | null) => (a === null ? b : b === null ? a : toMm(a) <= toMm(b) ? a : b);
const narrowInterval = (c: Interval, s: { min: Length | null; max: Length | null }): Interval => {
  const min = larger(c.min, s.min);
  const max = smaller(c.max, s.max);
  return { min, max, minExclusive: min === c.min && c.minExclusive, maxExclusive: max === c.max && c.maxExclusive };
};

/**
 * The qualification narrowed to what both the rules and the paper record allow, variable by variable, with
 * a limit naming the paper record for each variable narrowed. Never wider than the computed ranges.
 */
export function narrowToPaper(computed: QualifiedRanges, stated: StatedRanges, settledBy: string): QualifiedRanges {
  const p = parseStatedRanges(stated);
  const r: QualifiedRanges = structuredClone(computed);
  const limits: QualifiedRanges['limits'] = [];
  const note = (variable: string, text: string) =>
    limits.push({ variable, clause: `paper WPQ record (settled by ${settledBy})`, text, source: 'common-practice' });
  for (const d of rangeDifferences(computed, stated)) {
    if (d.variable === 'groovePositions') r.positions.groove = r.positions.groove.filter((x) => p.groovePositions!.includes(x));
    if (d.variable === 'filletPositions') r.positions.fillet = r.positions.fillet.filter((x) => p.filletPositions!.includes(x));
    if (d.variable === 'thickness') r.thickness = narrowInterval(r.thickness, p.thickness!);
    if (d.variable === 'diameter') r.diameter = narrowInterval(r.diameter, p.diameter!);
    if (d.variable === 'fNumbers') {
      r.fNumbers = r.fNumbers.filter((f) => p.fNumbers!.includes(f));
      r.fNumberBacking = r.fNumberBacking.filter((f) => p.fNumbers!.includes(f.fNumber));
    }
    note(d.variable, `${d.label} narrowed to the paper record: ${d.stated} (the rules compute ${d.computed})`);
  }
  if (r.grooveOnPipeUpTo24) r.grooveOnPipeUpTo24 = r.grooveOnPipeUpTo24.filter((x) => r.positions.groove.includes(x));
  r.limits = [...r.limits, ...limits];
  return r;
}
