// The foreman's question: may a welder with these qualified ranges weld this joint? Answered per product
// form (plate and pipe over 24 in OD; pipe up to 24 in OD) and per weld (groove, fillet), each refusal with
// its variable, clause and a message. Called for every welder × joint by the crew finder, so the passing
// path builds no strings and parses nothing it can check by hand.
import { jointSchema, type Joint, type JointCheck, type JointReason } from '../schemas/examination.js';
import { exceeds, formatLength, limitIn, valueIn, type DualSize, type Length } from '../units/length.js';
import { parseInput } from '../validation/parse-input.js';
import { codeNames } from '../names/display-names.js';
import { weldingPositionNames, type WeldingPosition } from './positions.js';
import { type QualifiedRanges } from './qualified-ranges.js';
import { type Interval } from './size-ranges.js';

/** Pipe over this OD takes the plate positions of a plate test (QW-461.9). */
const PIPE_24: DualSize = { in: 24, mm: 610 };

const POSITIONS = new Set(['F', 'H', 'V', 'O']);

const isLength = (l: unknown): l is Length => {
  if (typeof l !== 'object' || l === null) return false;
  const { value, unit } = l as { value?: unknown; unit?: unknown };
  return typeof value === 'number' && value > 0 && Number.isFinite(value) && (unit === 'in' || unit === 'mm');
};

// The hand check of the common case; anything else goes through the schema, which names the bad field.
function valid(j: Joint): boolean {
  return (
    (j.form === 'plate' || j.form === 'pipe') &&
    (j.weld === 'groove' || j.weld === 'fillet') &&
    POSITIONS.has(j.position) &&
    isLength(j.thickness) &&
    (j.outsideDiameter === undefined || isLength(j.outsideDiameter)) &&
    (j.fNumber === undefined || (Number.isInteger(j.fNumber) && j.fNumber >= 1 && j.fNumber <= 99)) &&
    (j.withoutFiller === undefined || typeof j.withoutFiller === 'boolean') &&
    typeof j.backing === 'boolean' &&
    (j.progression === undefined || j.progression === 'uphill' || j.progression === 'downhill') &&
    (j.transferMode === undefined ||
      j.transferMode === 'spray' ||
      j.transferMode === 'globular' ||
      j.transferMode === 'pulse' ||
      j.transferMode === 'short-circuit')
  );
}

/** Where a length falls against an interval, compared in the unit of the interval's end. */
function outside(l: Length, iv: Interval): 'below' | 'above' | null {
  if (iv.min) {
    const v = valueIn(l, iv.min.unit);
    if (iv.minExclusive ? !exceeds(v, iv.min.value) : exceeds(iv.min.value, v)) return 'below';
  }
  if (iv.max) {
    const v = valueIn(l, iv.max.unit);
    if (iv.maxExclusive ? !exceeds(iv.max.value, v) : exceeds(v, iv.max.value)) return 'above';
  }
  return null;
}

const show = (l: Length): string => formatLength(l, { digits: l.unit === 'mm' ? 2 : 3 });

function intervalWords(iv: Interval): string {
  const lo = iv.min ? `${iv.minExclusive ? 'over' : 'from'} ${show(iv.min)}` : '';
  const hi = iv.max ? `${iv.maxExclusive ? 'under' : 'up to'} ${show(iv.max)}` : '';
  return [lo, hi].filter(Boolean).join(' ') || 'any size';
}

const clauseOf = (r: QualifiedRanges, variable: string): string =>
  r.limits.find((l) => l.variable === variable)?.clause ?? codeNames[r.code];

const names = (ps: readonly WeldingPosition[]): string =>
  ps.length === 0 ? 'no position' : ps.map((p) => `${p} (${weldingPositionNames[p]})`).join(', ');

/**
 * Whether the joint is within the qualified ranges. `ranges` is what qualifiedRanges returned (not parsed
 * again); `joint` is checked and refused with the field named when it is not a joint.
 */
export function jointWithin(ranges: QualifiedRanges, joint: Joint): JointCheck {
  const j = valid(joint) ? joint : parseInput(jointSchema, joint);
  const r = ranges;
  const reasons: JointReason[] = [];
  const fillet = j.weld === 'fillet';
  const od = j.outsideDiameter;

  // positions, per product form
  const smallPipe = j.form === 'pipe' && od !== undefined && !exceeds(od.value, limitIn(PIPE_24, od.unit));
  const qualified = fillet
    ? r.positions.fillet
    : smallPipe && r.grooveOnPipeUpTo24
      ? r.grooveOnPipeUpTo24
      : r.positions.groove;
  if (!qualified.includes(j.position))
    reasons.push({
      variable: 'position',
      clause: fillet || !(smallPipe && r.grooveOnPipeUpTo24) ? clauseOf(r, 'positions') : 'QW-461.9',
      message: `${fillet ? 'Fillet' : 'Groove'} welds ${smallPipe && r.grooveOnPipeUpTo24 && !fillet ? 'on pipe up to 24 in OD ' : ''}are qualified in ${names(qualified)}; the joint is ${j.position} (${weldingPositionNames[j.position]}).`,
    });

  // thickness: groove welds by the groove range, fillet welds by the fillet range
  const tRange = fillet ? r.fillet.thickness : r.thickness;
  const tOut = outside(j.thickness, tRange);
  if (tOut)
    reasons.push({
      variable: 'thickness',
      clause: clauseOf(r, fillet ? 'fillet' : 'thickness'),
      message: `${fillet ? 'Base metal' : 'Weld metal'} thickness ${show(j.thickness)} is ${tOut} the qualified range (${intervalWords(tRange)}).`,
    });

  // diameter: pipe only
  if (j.form === 'pipe') {
    const dRange = fillet ? r.fillet.diameter : r.diameter;
    if (!od)
      reasons.push({
        variable: 'diameter',
        clause: clauseOf(r, 'diameter'),
        message: 'Enter the outside diameter of the pipe joint: the qualification limits it.',
      });
    else {
      const dOut = outside(od, dRange);
      if (dOut)
        reasons.push({
          variable: 'diameter',
          clause: clauseOf(r, fillet ? 'fillet' : 'diameter'),
          message: `Pipe OD ${show(od)} is ${dOut} the qualified range (${intervalWords(dRange)}).`,
        });
    }
  } else if (r.code === 'api-1104')
    reasons.push({
      variable: 'form',
      clause: clauseOf(r, 'diameter'),
      message: 'An API 1104 qualification covers pipeline welds, not plate.',
    });

  // filler metal
  if (r.withoutFillerOnly) {
    if (!j.withoutFiller)
      reasons.push({
        variable: 'fNumber',
        clause: clauseOf(r, 'fNumber'),
        message: 'Qualified without filler metal only; this joint is welded with filler metal.',
      });
  } else if (j.withoutFiller)
    reasons.push({
      variable: 'fNumber',
      clause: r.code === 'asme-ix' ? 'QW-404.14' : clauseOf(r, 'fNumber'),
      message: 'Welding without filler metal needs a test welded without filler metal.',
    });
  else if (!r.fNumbersAny) {
    if (j.fNumber === undefined)
      reasons.push({
        variable: 'fNumber',
        clause: clauseOf(r, 'fNumber'),
        message: 'Enter the F-No. of the filler metal: the qualification limits it.',
      });
    else {
      const entry = r.fNumberBacking.find((q) => q.fNumber === j.fNumber);
      if (!entry)
        reasons.push({
          variable: 'fNumber',
          clause: clauseOf(r, 'fNumber'),
          message: `F-No. ${j.fNumber} is not qualified (qualified: ${r.fNumbers.length ? r.fNumbers.map((f) => `F-No. ${f}`).join(', ') : 'none'}).`,
        });
      else if (!fillet && !entry.backing.includes(j.backing ? 'with' : 'without'))
        reasons.push({
          variable: 'fNumber',
          clause: clauseOf(r, 'fNumber'),
          message: `F-No. ${j.fNumber} is qualified ${entry.backing.join(' or ')} backing only; the joint is welded ${j.backing ? 'with' : 'without'} backing.`,
        });
    }
  }

  // backing: groove welds
  if (!fillet && !j.backing && !r.backing.includes('without'))
    reasons.push({
      variable: 'backing',
      clause: clauseOf(r, 'backing'),
      message: 'Qualified with backing only; the joint is welded without backing.',
    });

  // vertical progression
  if (j.position === 'V' && r.progression !== null) {
    if (!j.progression)
      reasons.push({
        variable: 'progression',
        clause: clauseOf(r, 'progression'),
        message: `Say whether the vertical joint is welded uphill or downhill: qualified ${r.progression.join(' or ')} only.`,
      });
    else if (!r.progression.includes(j.progression))
      reasons.push({
        variable: 'progression',
        clause: clauseOf(r, 'progression'),
        message: `Qualified for vertical welding ${r.progression.join(' or ')} only; the joint is welded ${j.progression}.`,
      });
  }

  // GMAW transfer mode
  if (r.transferModes !== null) {
    if (!j.transferMode)
      reasons.push({
        variable: 'transferMode',
        clause: clauseOf(r, 'transferMode'),
        message: `Say the GMAW transfer mode of the joint: qualified ${r.transferModes.join(', ')}.`,
      });
    else if (!r.transferModes.includes(j.transferMode))
      reasons.push({
        variable: 'transferMode',
        clause: clauseOf(r, 'transferMode'),
        message: `Qualified for ${r.transferModes.join(', ')} transfer; the joint is welded with ${j.transferMode}.`,
      });
  }

  return { within: reasons.length === 0, reasons };
}
