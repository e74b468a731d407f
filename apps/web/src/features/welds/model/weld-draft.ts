// The rows of the weld log while a foreman types them: one row per weld, joint details copied from the row
// above (or from the WPS), fill-down of one column, the body each row is saved with, and the live check of
// each welder against their qualifications with the rules' jointWithin (the server checks again, with
// continuity on the date welded, and is the one that decides).
import {
  jointWithin,
  parseLength,
  pipeDimensions,
  RulesInputError,
  type QualifiedRanges,
  type WeldBody,
  type WeldLayer,
  type WeldWelder,
} from '@beadroll/rules';

export interface WeldRowDraft {
  key: string;
  weldNumber: string;
  weldedOn: string;
  procedureId: string;
  /** The welder of the root (or of the whole weld when there is no second welder). */
  stamp: string;
  process: string;
  /** A second welder for fill and cap, when a different welder made them. */
  fillStamp: string;
  fillProcess: string;
  form: 'plate' | 'pipe';
  weld: 'groove' | 'fillet';
  position: 'F' | 'H' | 'V' | 'O';
  thickness: string;
  outsideDiameter: string;
  nps: string;
  schedule: string;
  fNumber: string;
  backing: 'with' | 'without';
  progression: '' | 'uphill' | 'downhill';
  examMethod: '' | 'visual' | 'RT' | 'UT';
  examReport: string;
  examResult: '' | 'accepted' | 'rejected';
}

export type WeldField = Exclude<keyof WeldRowDraft, 'key'>;

/** Columns that fill down and that a new row copies from the one above (everything but the weld number). */
export const COPIED: WeldField[] = [
  'weldedOn',
  'procedureId',
  'stamp',
  'process',
  'fillStamp',
  'fillProcess',
  'form',
  'weld',
  'position',
  'thickness',
  'outsideDiameter',
  'nps',
  'schedule',
  'fNumber',
  'backing',
  'progression',
];

let counter = 0;
const nextKey = () => `row-${++counter}`;

export function emptyRow(weldedOn: string): WeldRowDraft {
  return {
    key: nextKey(),
    weldNumber: '',
    weldedOn,
    procedureId: '',
    stamp: '',
    process: 'SMAW',
    fillStamp: '',
    fillProcess: '',
    form: 'pipe',
    weld: 'groove',
    position: 'F',
    thickness: '',
    outsideDiameter: '',
    nps: '',
    schedule: '',
    fNumber: '',
    backing: 'without',
    progression: '',
    examMethod: '',
    examReport: '',
    examResult: '',
  };
}

/** The next weld number after `n`: its last run of digits plus one, keeping leading zeros ('N4' → 'N5', 'S-09' → 'S-10'). */
export function nextWeldNumber(n: string): string {
  const m = /^(.*?)(\d+)(\D*)$/.exec(n);
  if (!m) return '';
  const [, head = '', digits = '', tail = ''] = m;
  return `${head}${String(Number(digits) + 1).padStart(digits.length, '0')}${tail}`;
}

/** A new row below `prev`: the joint details, date, WPS and welders copied, the weld number counted on. */
export function rowAfter(prev: WeldRowDraft | undefined, today: string): WeldRowDraft {
  const row = emptyRow(today);
  if (!prev) return row;
  for (const f of COPIED) (row as unknown as Record<string, string>)[f] = prev[f];
  row.weldNumber = nextWeldNumber(prev.weldNumber);
  return row;
}

/** The value of `field` in row `from` copied into every row below it. */
export function fillDown(rows: WeldRowDraft[], field: WeldField, from = 0): WeldRowDraft[] {
  const source = rows[from];
  if (!source) return rows;
  return rows.map((r, i) => (i > from ? { ...r, [field]: source[field] } : r));
}

/** Joint details from a WPS of the register: its F-No. and, when it allows one position only, that position. */
export function fromProcedure(row: WeldRowDraft, wps: { id: string; fNumber: number | null; positions: string[]; processes: string[] }): WeldRowDraft {
  const next = { ...row, procedureId: wps.id };
  if (wps.fNumber) next.fNumber = String(wps.fNumber);
  if (wps.processes[0] && !wps.processes.includes(row.process)) next.process = wps.processes[0];
  if (wps.positions.length === 1) next.position = wps.positions[0] as WeldRowDraft['position'];
  return next;
}

export type RowProblems = Partial<Record<WeldField, string>>;

function readSize(text: string): { value: number; unit: 'in' | 'mm' } | string {
  try {
    const l = parseLength(text);
    return { value: l.value, unit: l.unit };
  } catch (e) {
    return e instanceof RulesInputError ? (Object.values(e.fields)[0] ?? e.message) : 'Not a size';
  }
}

/** The joint of a row as the rules read it, or the problems of its fields. */
export function jointOf(row: WeldRowDraft): { joint: WeldBody['joint'] } | { problems: RowProblems } {
  const problems: RowProblems = {};
  const t = row.thickness.trim() ? readSize(row.thickness) : 'Enter the thickness';
  if (typeof t === 'string') problems.thickness = t;
  let od: { value: number; unit: 'in' | 'mm' } | undefined;
  if (row.form === 'pipe') {
    if (row.outsideDiameter.trim()) {
      const r = readSize(row.outsideDiameter);
      if (typeof r === 'string') problems.outsideDiameter = r;
      else od = r;
    } else if (row.nps.trim() && row.schedule.trim()) {
      try {
        od = pipeDimensions(row.nps, row.schedule).outsideDiameter;
      } catch (e) {
        problems.nps = e instanceof RulesInputError ? (Object.values(e.fields)[0] ?? e.message) : 'Not a pipe size';
      }
    } else problems.outsideDiameter = 'Enter the OD, or the NPS and schedule';
  }
  const f = row.fNumber.trim();
  if (f && !/^\d{1,2}$/.test(f)) problems.fNumber = 'F-No. is a whole number';
  if (Object.keys(problems).length || typeof t === 'string') return { problems };
  return {
    joint: {
      form: row.form,
      weld: row.weld,
      position: row.position,
      thickness: t,
      ...(od ? { outsideDiameter: od } : {}),
      ...(row.form === 'pipe' && row.nps.trim() ? { nps: row.nps.trim(), schedule: row.schedule.trim() } : {}),
      ...(f ? { fNumber: Number(f) } : {}),
      backing: row.backing === 'with',
      ...(row.progression ? { progression: row.progression } : {}),
    },
  };
}

/** The body of POST /api/welds for a row, or the problems to fix first (welders by stamp from `welders`). */
export function bodyOf(
  row: WeldRowDraft,
  ctx: { shopId: string; jobReference: string; welders: Map<string, WeldWelder> },
): { body: WeldBody } | { problems: RowProblems } {
  const problems: RowProblems = {};
  if (!row.weldNumber.trim()) problems.weldNumber = 'Enter the weld number';
  if (!row.weldedOn) problems.weldedOn = 'Enter the date welded';
  const root = ctx.welders.get(row.stamp.trim().toUpperCase());
  if (!root) problems.stamp = row.stamp.trim() ? `No active welder has stamp ${row.stamp.trim()}` : 'Enter the stamp';
  const fill = row.fillStamp.trim() ? ctx.welders.get(row.fillStamp.trim().toUpperCase()) : undefined;
  if (row.fillStamp.trim() && !fill) problems.fillStamp = `No active welder has stamp ${row.fillStamp.trim()}`;
  const joint = jointOf(row);
  if ('problems' in joint) Object.assign(problems, joint.problems);
  if (row.examMethod && !row.examResult) problems.examResult = 'Say whether it was accepted or rejected';
  if (Object.keys(problems).length || !root || 'problems' in joint) return { problems };
  const rootLayer: WeldLayer = fill ? 'root' : 'all';
  const passes: WeldBody['passes'] = [{ welderId: root.id, process: row.process as WeldBody['passes'][number]['process'], layer: rootLayer }];
  if (fill)
    passes.push({ welderId: fill.id, process: (row.fillProcess || row.process) as WeldBody['passes'][number]['process'], layer: 'fill' });
  return {
    body: {
      shopId: ctx.shopId,
      jobReference: ctx.jobReference,
      weldNumber: row.weldNumber.trim(),
      weldedOn: row.weldedOn,
      procedureId: row.procedureId || null,
      joint: joint.joint,
      passes,
      examination:
        row.examMethod && row.examResult
          ? { method: row.examMethod, reportNumber: row.examReport.trim(), result: row.examResult }
          : null,
    },
  };
}

export interface LiveCheck {
  stamp: string;
  process: string;
  /** null: nothing to say yet (no welder, or the joint is not complete). */
  within: boolean | null;
  /** The qualification that allows it, when one does. */
  number: string | null;
  reasons: { clause: string; message: string }[];
}

/**
 * The live check of one welder and process on a row: within the ranges of some qualification of the
 * process, not revoked and not lapsed on the date welded (by the lapse date as of today).
 */
export function liveCheck(welder: WeldWelder | undefined, process: string, row: WeldRowDraft): LiveCheck | null {
  if (!welder) return null;
  const joint = jointOf(row);
  const base = { stamp: welder.stamp, process };
  if ('problems' in joint) return { ...base, within: null, number: null, reasons: [] };
  const quals = welder.qualifications.filter((q) => q.process === process);
  if (quals.length === 0)
    return { ...base, within: false, number: null, reasons: [{ clause: 'WPQ', message: `${welder.stamp} holds no ${process} qualification.` }] };
  const reasons: LiveCheck['reasons'] = [];
  const { nps: _n, schedule: _s, ...plain } = joint.joint;
  for (const q of quals) {
    if (q.revokedOn && q.revokedOn <= row.weldedOn) {
      reasons.push({ clause: 'QW-322.1(b)', message: `${q.number} was revoked on ${q.revokedOn}.` });
      continue;
    }
    if (q.lapsesOn && q.lapsesOn <= row.weldedOn) {
      reasons.push({ clause: 'continuity', message: `${q.number} lapsed on ${q.lapsesOn}.` });
      continue;
    }
    if (!q.ranges || !('positions' in q.ranges)) continue;
    const check = jointWithin(q.ranges as unknown as QualifiedRanges, plain);
    if (check.within) return { ...base, within: true, number: q.number, reasons: [] };
    reasons.push(...check.reasons.map((r) => ({ clause: r.clause, message: `${q.number}: ${r.message}` })));
  }
  return { ...base, within: false, number: null, reasons };
}
