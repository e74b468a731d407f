// What a passing performance qualification coupon qualifies the welder to weld, per code, with the clause
// behind every limit (TRADE.md §3 to §5).
import {
  couponSchema,
  type Coupon,
  type CouponInput,
  type Progression,
  type TransferMode,
} from '../schemas/coupon.js';
import { type CodeId } from '../schemas/common.js';
import { codeNames } from '../names/display-names.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import {
  asmeFNumberGroups,
  awsSmawFNumbers,
  fNumberRow,
  type Backing,
  type FNumberQualification,
} from './f-numbers.js';
import { positionTables, type PositionRow } from './position-tables.js';
import { isFilletTest, splitTestPosition, weldingPositions, type WeldingPosition } from './positions.js';
import { sizeRanges, type Interval, type RangeLimit } from './size-ranges.js';

export type QualifiedRanges = {
  code: CodeId;
  process: Coupon['process'];
  positions: { groove: WeldingPosition[]; fillet: WeldingPosition[] };
  /** null = no limit from this code; an exclusive end is itself outside the range (API 1104 groups). */
  thickness: Interval;
  /** Smallest pipe OD qualified (and the largest, where the code sets one). */
  diameter: Interval;
  /** Fillet welds: thickness and diameter qualified (a groove test sets no limit under QW-303.1). */
  fillet: { thickness: Interval; diameter: Interval };
  /** Groove positions on pipe of 2-7/8 in to 24 in OD, where a plate test qualifies fewer there than on
   *  plate and larger pipe (ASME QW-461.9); null = the groove positions above apply to every pipe. */
  grooveOnPipeUpTo24: WeldingPosition[] | null;
  fNumbers: number[];
  /** true: the code has no F-No. variable for this process (AWS D1.1 other than SMAW): any F-No. */
  fNumbersAny: boolean;
  /** Welded without filler metal (autogenous): qualifies welding without filler metal only (QW-404.14). */
  withoutFillerOnly: boolean;
  /** The backing allowed with each qualified F-No. */
  fNumberBacking: FNumberQualification[];
  backing: Backing[];
  progression: Progression[] | null;
  /** GMAW only: the transfer modes qualified. */
  transferModes: TransferMode[] | null;
  limits: RangeLimit[];
  notice: string;
};

export const RANGES_NOTICE =
  'Computed from the rules as Beadroll understands them; the code edition in force, the company quality manual and the responsible inspector govern. Each limit names its clause.';

const CLAUSES: Record<CodeId, { backing: string; fNumber: string; progression: string; transfer: string }> = {
  'asme-ix': { backing: 'QW-402.4', fNumber: 'QW-433', progression: 'QW-405.3', transfer: 'QW-409.2' },
  'aws-d1.1': {
    backing: 'AWS D1.1 Table 4.12 (2015) item (6), backing',
    fNumber: 'AWS D1.1 Table 4.12 (2015) item (2), Table 4.13',
    progression: 'AWS D1.1 Table 4.12 (2015) item (5), vertical progression',
    transfer: 'AWS D1.1 Table 4.12 (2015) item (7), GMAW-S',
  },
  'api-1104': {
    backing: 'API 1104 single qualification',
    fNumber: 'API 1104 single qualification (filler metal group)',
    progression: 'API 1104 single qualification (direction of welding)',
    transfer: 'API 1104 single qualification',
  },
  'iso-9606-1': {
    backing: 'ISO 9606-1 weld details',
    fNumber: 'ISO 9606-1 filler material',
    progression: 'ISO 9606-1 welding positions',
    transfer: 'ISO 9606-1 welding process',
  },
};

const ordered = (set: Set<WeldingPosition>): WeldingPosition[] => weldingPositions.filter((p) => set.has(p));

type PositionsResult = {
  groove: WeldingPosition[];
  fillet: WeldingPosition[];
  grooveOnPipeUpTo24: WeldingPosition[] | null;
  limits: RangeLimit[];
};

// A handful of distinct answers, asked for on every keystroke of the coupon form: kept once computed.
const positionsCache = new Map<string, PositionsResult>();

function positionsOf(c: Coupon): PositionsResult {
  const key = `${c.code}|${c.form}|${c.weld}|${c.position}|${c.progression ?? ''}`;
  let hit = positionsCache.get(key);
  if (!hit) {
    hit = computePositions(c);
    positionsCache.set(key, hit);
  }
  return {
    groove: [...hit.groove],
    fillet: [...hit.fillet],
    grooveOnPipeUpTo24: hit.grooveOnPipeUpTo24 ? [...hit.grooveOnPipeUpTo24] : null,
    limits: hit.limits.map((l) => ({ ...l })),
  };
}

function computePositions(c: Coupon): PositionsResult {
  if (isFilletTest(c.position) !== (c.weld === 'fillet'))
    throw RulesInputError.field(
      'position',
      `${c.position} is a ${isFilletTest(c.position) ? 'fillet' : 'groove'} test position; the coupon is a ${c.weld} weld`,
    );
  const set = positionTables[c.code];
  const tables = set.byProgression && c.progression ? set.byProgression[c.progression] : set;
  const table = tables[c.form];
  if (Object.keys(table).length === 0)
    throw RulesInputError.field(
      'form',
      `${codeNames[c.code]} welder qualification tests are not welded on ${c.form}`,
    );
  const groove = new Set<WeldingPosition>();
  const fillet = new Set<WeldingPosition>();
  for (const part of splitTestPosition(c.position)) {
    const row: PositionRow | undefined = table[part];
    if (!row)
      throw RulesInputError.field(
        'position',
        `${part} is not a ${c.form} test position under ${codeNames[c.code]}`,
      );
    row.groove.forEach((p) => groove.add(p));
    row.fillet.forEach((p) => fillet.add(p));
  }
  const g = ordered(groove);
  const f = ordered(fillet);
  const limits: RangeLimit[] = [
    {
      variable: 'positions',
      clause: set.clause,
      text: `Test position ${c.position} (${c.form}) qualifies groove welds in ${g.join(', ') || 'no position'} and fillet welds in ${f.join(', ') || 'no position'}.`,
      source: set.source,
    },
  ];
  let grooveOnPipeUpTo24: WeldingPosition[] | null = null;
  if (c.code === 'asme-ix' && c.form === 'plate' && c.weld === 'groove') {
    // pipe of 2-7/8 in to 24 in OD: F only, F and H where a 2G plate is part of the test; plate and pipe
    // over 24 in OD take the plate positions above
    grooveOnPipeUpTo24 = splitTestPosition(c.position).includes('2G') ? ['F', 'H'] : ['F'];
    limits.push({
      variable: 'positions',
      clause: 'QW-461.9',
      text: `On pipe of 2-7/8 in (73 mm) to 24 in (610 mm) OD this plate test qualifies groove welds in ${grooveOnPipeUpTo24.join(' and ')} only; on plate and on pipe over 24 in OD, in ${g.join(', ')}.`,
      source: 'from-memory',
    });
  }
  if (c.code === 'iso-9606-1' && c.weld === 'groove')
    limits.push({
      variable: 'positions',
      clause: set.clause,
      text: 'A butt weld test does not qualify fillet welds unless a supplementary fillet weld test is made.',
      source: 'from-memory',
    });
  return { groove: g, fillet: f, grooveOnPipeUpTo24, limits };
}

type FNumbersResult = {
  fNumbers: number[];
  detail: FNumberQualification[];
  any: boolean;
  withoutFillerOnly: boolean;
  limit: RangeLimit;
};
const fNumbersCache = new Map<string, FNumbersResult>();

function fNumbersOf(c: Coupon, backing: Backing): FNumbersResult {
  const key = `${c.code}|${c.process}|${c.fNumber ?? ''}|${c.withoutFiller === true}|${backing}`;
  let hit = fNumbersCache.get(key);
  if (!hit) {
    hit = computeFNumbers(c, backing);
    fNumbersCache.set(key, hit);
  }
  return {
    fNumbers: [...hit.fNumbers],
    detail: hit.detail.map((d) => ({ fNumber: d.fNumber, backing: [...d.backing] })),
    any: hit.any,
    withoutFillerOnly: hit.withoutFillerOnly,
    limit: { ...hit.limit },
  };
}

const byBacking = (backing: Backing): Backing[] => (backing === 'without' ? ['with', 'without'] : ['with']);

function computeFNumbers(c: Coupon, backing: Backing): FNumbersResult {
  const clause = CLAUSES[c.code].fNumber;
  const none = { any: false, withoutFillerOnly: false };
  if (c.withoutFiller) {
    if (c.process !== 'GTAW' && c.process !== 'PAW')
      throw RulesInputError.field('withoutFiller', 'Only GTAW and PAW are welded without filler metal');
    if (c.fNumber !== undefined)
      throw RulesInputError.field('fNumber', 'A coupon welded without filler metal has no F-No.: clear it');
    return {
      fNumbers: [],
      detail: [],
      any: false,
      withoutFillerOnly: true,
      limit: {
        variable: 'fNumber',
        clause: c.code === 'asme-ix' ? 'QW-404.14' : clause,
        text: 'Welded without filler metal (autogenous): qualifies welding without filler metal only.',
        source: c.code === 'asme-ix' ? 'from-memory' : 'beadroll-default',
      },
    };
  }
  if (c.code === 'aws-d1.1' && c.process !== 'SMAW')
    return {
      fNumbers: c.fNumber === undefined ? [] : [c.fNumber],
      detail: [],
      any: true,
      withoutFillerOnly: false,
      limit: {
        variable: 'fNumber',
        clause,
        text: `AWS D1.1 has no F-No. variable for ${c.process}: the filler metal group does not limit this qualification.`,
        source: 'from-memory',
      },
    };
  if (c.fNumber === undefined)
    return {
      fNumbers: [],
      detail: [],
      ...none,
      limit: {
        variable: 'fNumber',
        clause,
        text: 'No F-No. given (e.g. welding without filler metal): no filler metal is qualified.',
        source: 'beadroll-default',
      },
    };
  if (c.code === 'aws-d1.1') {
    const down = awsSmawFNumbers[c.fNumber];
    if (down)
      return {
        fNumbers: [...down],
        detail: down.map((f) => ({ fNumber: f, backing: ['with', 'without'] })),
        ...none,
        limit: {
          variable: 'fNumber',
          clause,
          text: `SMAW electrode F${c.fNumber} qualifies ${down.map((f) => `F${f}`).join(', ')}, with or without backing.`,
          source: 'from-memory',
        },
      };
  }
  const row = c.code === 'asme-ix' ? fNumberRow(c.fNumber, backing) : undefined;
  if (row)
    return {
      fNumbers: row.qualifies.map((q) => q.fNumber),
      detail: row.qualifies,
      ...none,
      limit: {
        variable: 'fNumber',
        clause,
        text: `F-No. ${c.fNumber} ${backing} backing qualifies ${row.qualifies.map((q) => `F-No. ${q.fNumber} ${q.backing.join(' or ')} backing`).join('; ')}.`,
        source: 'from-memory',
      },
    };
  const fNo = c.fNumber;
  const group = c.code === 'asme-ix' ? asmeFNumberGroups.find((g) => g.members.includes(fNo)) : undefined;
  if (group)
    return {
      fNumbers: [...group.members],
      detail: group.members.map((f) => ({ fNumber: f, backing: byBacking(backing) })),
      ...none,
      limit: {
        variable: 'fNumber',
        clause,
        text: `F-No. ${fNo}: ${group.text}; welded ${backing} backing, so ${backing === 'without' ? 'with or without' : 'with'} backing.`,
        source: 'from-memory',
      },
    };
  const why =
    c.code === 'asme-ix'
      ? `F-No. ${fNo} is outside Beadroll's QW-433 tables`
      : c.code === 'aws-d1.1'
        ? `SMAW F${fNo} is outside the D1.1 electrode groups F1 to F4`
        : 'This code groups filler metals its own way and Beadroll has no interchange table for it';
  return {
    fNumbers: [fNo],
    detail: [{ fNumber: fNo, backing: byBacking(backing) }],
    ...none,
    limit: {
      variable: 'fNumber',
      clause,
      text: `${why}: the F-No. tested (${fNo}) only.`,
      source: 'beadroll-default',
    },
  };
}

function backingOf(c: Coupon): { backing: Backing[]; limit: RangeLimit } {
  const clause = CLAUSES[c.code].backing;
  const source = c.code === 'api-1104' ? 'beadroll-default' : 'from-memory';
  const adopted =
    source === 'beadroll-default' ? ' (the ASME QW-402.4 rule, applied by Beadroll to this code)' : '';
  if (c.weld === 'fillet')
    return {
      backing: ['with', 'without'],
      limit: {
        variable: 'backing',
        clause,
        text: 'Backing does not limit a fillet weld qualification.',
        source: 'beadroll-default',
      },
    };
  return c.backing
    ? {
        backing: ['with'],
        limit: {
          variable: 'backing',
          clause,
          text: `Welded with backing: qualifies welding with backing only${adopted}.`,
          source,
        },
      }
    : {
        backing: ['with', 'without'],
        limit: {
          variable: 'backing',
          clause,
          text: `Welded without backing: qualifies with and without backing${adopted}.`,
          source,
        },
      };
}

function progressionOf(
  c: Coupon,
  vertical: boolean,
): { progression: Progression[] | null; limit: RangeLimit } {
  const clause = CLAUSES[c.code].progression;
  if (!vertical)
    return {
      progression: null,
      limit: {
        variable: 'progression',
        clause,
        text: 'No vertical position is qualified, so vertical progression does not apply.',
        source: 'from-memory',
      },
    };
  if (!c.progression)
    throw RulesInputError.field(
      'progression',
      'This test qualifies vertical welding: say whether it was welded uphill or downhill',
    );
  return {
    progression: [c.progression],
    limit: {
      variable: 'progression',
      clause,
      text: `Welded ${c.progression}: qualifies vertical welding ${c.progression} only; the other progression needs its own test.`,
      source: 'from-memory',
    },
  };
}

function transferOf(c: Coupon): { transferModes: TransferMode[] | null; limit: RangeLimit | null } {
  if (c.process !== 'GMAW') return { transferModes: null, limit: null };
  if (!c.transferMode)
    throw RulesInputError.field(
      'transferMode',
      'GMAW: choose the transfer mode used (spray, globular, pulse or short-circuit)',
    );
  const clause = CLAUSES[c.code].transfer;
  const source = c.code === 'asme-ix' || c.code === 'aws-d1.1' ? 'from-memory' : 'beadroll-default';
  return c.transferMode === 'short-circuit'
    ? {
        transferModes: ['short-circuit'],
        limit: {
          variable: 'transferMode',
          clause,
          text: 'Short-circuit transfer qualifies short-circuit transfer only.',
          source,
        },
      }
    : {
        transferModes: ['spray', 'globular', 'pulse'],
        limit: {
          variable: 'transferMode',
          clause,
          text: `${c.transferMode} transfer qualifies spray, globular and pulse transfer, not short-circuit.`,
          source,
        },
      };
}

/** The ranges a passing coupon qualifies, each limit with its clause, text and kind of source. */
export function qualifiedRanges(input: CouponInput): QualifiedRanges {
  const c = parseInput(couponSchema, input);
  if (c.form === 'pipe' && !c.outsideDiameter)
    throw RulesInputError.field('outsideDiameter', 'Enter the outside diameter of the pipe coupon');
  const positions = positionsOf(c);
  const vertical = positions.groove.includes('V') || positions.fillet.includes('V');
  const backing = backingOf(c);
  const f = fNumbersOf(c, c.backing ? 'with' : 'without');
  const progression = progressionOf(c, vertical);
  const transfer = transferOf(c);
  const sizes = sizeRanges[c.code](c);
  const limits = [...positions.limits, ...sizes.limits, f.limit, backing.limit, progression.limit];
  if (transfer.limit) limits.push(transfer.limit);
  return {
    code: c.code,
    process: c.process,
    positions: { groove: positions.groove, fillet: positions.fillet },
    thickness: sizes.thickness,
    diameter: sizes.diameter,
    fillet: sizes.fillet,
    grooveOnPipeUpTo24: positions.grooveOnPipeUpTo24,
    fNumbers: f.fNumbers,
    fNumbersAny: f.any,
    withoutFillerOnly: f.withoutFillerOnly,
    fNumberBacking: f.detail,
    backing: backing.backing,
    progression: progression.progression,
    transferModes: transfer.transferModes,
    limits,
    notice: RANGES_NOTICE,
  };
}
