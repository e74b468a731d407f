import { type Length } from '../units/length.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import {
  b3610mPipeSizes,
  b3619mPipeSizes,
  pipeSchedules,
  pipeStandardOf,
  type PipeSchedule,
  type PipeSizeRow,
} from './b36-10m.js';

const bySize = new Map<string, PipeSizeRow>(b3610mPipeSizes.map((r) => [r.nps, r]));
const stainlessBySize = new Map<string, PipeSizeRow>(b3619mPipeSizes.map((r) => [r.nps, r]));
const decimalNps = new Map<number, string>(
  b3610mPipeSizes.map((r) => {
    const [whole, frac] = r.nps.split('-');
    const value = frac === undefined ? fractionValue(whole ?? '') : Number(whole) + fractionValue(frac);
    return [value, r.nps];
  }),
);

function fractionValue(text: string): number {
  const [n, d] = text.split('/');
  return d === undefined ? Number(n) : Number(n) / Number(d);
}

/** '1 1/4', '1-1/4', '1.25', 'NPS 2', '2"' → the row key used by the table ('1-1/4', '2'). */
export function normalizeNps(text: string): string | null {
  const t = text
    .trim()
    .toLowerCase()
    .replace(/^nps\s*/, '')
    .replace(/\s*(in|")$/, '')
    .replace(/\s+/g, '-');
  if (bySize.has(t)) return t;
  const asNumber = Number(t);
  if (t !== '' && Number.isFinite(asNumber)) return decimalNps.get(asNumber) ?? null;
  return null;
}

/** 'Sch 40', 'sch40', '40', 'std', 'XS', '10s', 'Sch 10 S' → the table's schedule key. */
export function normalizeSchedule(text: string): PipeSchedule | null {
  const t = text
    .trim()
    .toUpperCase()
    .replace(/^SCH(EDULE)?\.?\s*/, '')
    .replace(/\s+/g, '');
  return (pipeSchedules as readonly string[]).includes(t) ? (t as PipeSchedule) : null;
}

/**
 * Outside diameter and nominal wall of a pipe size and schedule (inches): ASME B36.10M for carbon steel
 * schedules and weight classes, ASME B36.19M for the stainless S schedules.
 * Throws a RangeError (RulesInputError) for a size or a schedule that Beadroll's tables do not hold.
 */
export function pipeDimensions(nps: string, schedule: string): { outsideDiameter: Length; wall: Length } {
  const size = normalizeNps(nps);
  const row = size === null ? undefined : bySize.get(size);
  if (!row)
    throw RulesInputError.field(
      'nps',
      `NPS "${nps}" is not an ASME B36.10M size that Beadroll lists (NPS 1/2 to 48)`,
    );
  const sch = normalizeSchedule(schedule);
  if (sch === null)
    throw RulesInputError.field(
      'schedule',
      `Schedule "${schedule}" is not one of ${pipeSchedules.join(', ')}`,
    );
  const standard = pipeStandardOf(sch);
  const table = standard === 'ASME B36.19M' ? stainlessBySize : bySize;
  const wall = table.get(row.nps)?.walls[sch];
  if (wall === undefined) {
    const defined = pipeSchedules.filter((s) => table.get(row.nps)?.walls[s] !== undefined).join(', ');
    throw RulesInputError.field(
      'schedule',
      `${standard} defines no schedule ${sch} for NPS ${row.nps} that Beadroll lists${defined ? ` (it has ${defined})` : ''}: enter the wall thickness`,
    );
  }
  return { outsideDiameter: { value: row.od, unit: 'in' }, wall: { value: wall, unit: 'in' } };
}
