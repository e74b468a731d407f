// The bend specimens a coupon calls for, so the coupon form can propose the right set (TRADE.md §2).
import { bendSpecimenProposalInputSchema, type BendSpecimenProposalInput } from '../schemas/coupon.js';
import { type CodeId } from '../schemas/common.js';
import { codeNames } from '../names/display-names.js';
import { isFilletTest, splitTestPosition, type TestPosition } from '../ranges/positions.js';
import { exceeds, formatLength, limitIn, type DualSize, type Length } from '../units/length.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';

export type SpecimenKind = 'face' | 'root' | 'side';
export type SpecimenSet = Array<{ kind: SpecimenKind; count: number }>;
export type BendSpecimenProposal = {
  /** false: Beadroll has no specimen table for this code; take the set from the code. */
  known: boolean;
  /** The proposed set first, then the alternatives the code allows. */
  options: SpecimenSet[];
  clause: string | null;
  source: string;
  text: string;
};

const IN_3_8: DualSize = { in: 3 / 8, mm: 10 };
const IN_3_4: DualSize = { in: 3 / 4, mm: 19 };
const IN_1: DualSize = { in: 1, mm: 25 };

const faceRoot = (n: number): SpecimenSet => [
  { kind: 'face', count: n },
  { kind: 'root', count: n },
];
const side = (n: number): SpecimenSet => [{ kind: 'side', count: n }];
const below = (t: Length, limit: DualSize): boolean => exceeds(limitIn(limit, t.unit), t.value);

/** How many coupons a combined test position stands for: '3G+4G' is two plates, each with its own set. */
export const couponsOf = (position: TestPosition): number =>
  position === '3G+4G' ? 2 : position === '2G+3G+4G' ? 3 : 1;

function asmeIx(position: TestPosition, t: Length): BendSpecimenProposal {
  const parts = splitTestPosition(position);
  const pipeFixed = parts.some((p) => p === '5G' || p === '6G');
  // 5G and 6G pipe coupons take four bends; a 2G + 5G coupon six (QW-452.1(a)); 3G + 4G is two
  // coupons, each with its own full set
  const pairs = position === '2G+5G' ? 3 : pipeFixed ? 2 : couponsOf(position);
  const tText = formatLength(t);
  const options = below(t, IN_3_8)
    ? [faceRoot(pairs)]
    : below(t, IN_3_4)
      ? [side(2 * pairs), faceRoot(pairs)]
      : [side(2 * pairs)];
  const band = below(t, IN_3_8)
    ? 'under 3/8 in (10 mm): face and root bends'
    : below(t, IN_3_4)
      ? '3/8 in (10 mm) to under 3/4 in (19 mm): side bends, or face and root bends instead'
      : '3/4 in (19 mm) and over: side bends';
  return {
    known: true,
    options,
    clause: 'QW-452.1(a)',
    source: 'published: ASME IX QW-452.1(a) (published copies, read second-hand)',
    text: `Deposited weld metal ${tText}, ${band}; ${2 * pairs} specimens in all for ${position}${couponsOf(position) > 1 ? ` (${couponsOf(position)} coupons, each with its own full set)` : ''}.`,
  };
}

function awsD11(form: 'plate' | 'pipe', position: TestPosition, t: Length): BendSpecimenProposal {
  const clause = 'AWS D1.1 Table 4.11 (2015)';
  const source = 'from memory: AWS D1.1 Table 4.11 (2015) / 6.11 and 10.13 (2020)';
  if (form === 'pipe') {
    const fixed = splitTestPosition(position).some((p) => p === '5G' || p === '6G' || p === '6GR');
    return fixed
      ? {
          known: true,
          options: [faceRoot(2), side(4)],
          clause,
          source,
          text: `Pipe ${position}: two face and two root bends, or four side bends.`,
        }
      : {
          known: true,
          options: [faceRoot(1), side(2)],
          clause,
          source,
          text: `Pipe ${position}: one face and one root bend, or two side bends.`,
        };
  }
  const n = couponsOf(position);
  const each = n > 1 ? ` for each of the ${n} coupons` : '';
  // 3/8 in plate: face and root (or two side); over 3/8 in: two side bends (from memory: Table 4.11)
  return below(t, IN_3_8) || !exceeds(t.value, limitIn(IN_3_8, t.unit))
    ? {
        known: true,
        options: [faceRoot(n), side(2 * n)],
        clause,
        source,
        text: `Plate of ${formatLength(t)} (the 3/8 in test plate): one face and one root bend, or two side bends${each}.`,
      }
    : {
        known: true,
        options: [side(2 * n)],
        clause,
        source,
        text: `Plate of ${formatLength(t)} (over 3/8 in${below(t, IN_1) ? ', under 1 in' : ''}): two side bends${each}.`,
      };
}

// API 1104 welder qualification: specimens by OD and wall (from memory: API 1104 welder qualification
// specimen table, 20th/21st editions). Tensile specimens are listed for the record; Beadroll does not judge them.
const IN_2_375: DualSize = { in: 2.375, mm: 60.3 };
const IN_4_5: DualSize = { in: 4.5, mm: 114.3 };
const IN_12_75: DualSize = { in: 12.75, mm: 323.9 };
const IN_1_2: DualSize = { in: 0.5, mm: 12.7 };

export type Api1104Specimens = {
  tensile: number;
  nickBreak: number;
  root: number;
  face: number;
  side: number;
};

export function api1104Specimens(od: Length, wall: Length): { counts: Api1104Specimens; band: string } {
  const thick = exceeds(wall.value, limitIn(IN_1_2, wall.unit));
  const wallText = thick ? 'wall over 1/2 in (12.7 mm)' : 'wall 1/2 in (12.7 mm) or less';
  const over = (l: DualSize) => exceeds(od.value, limitIn(l, od.unit));
  if (!over(IN_4_5)) {
    const band = below(od, IN_2_375) ? 'OD under 2-3/8 in (60.3 mm)' : 'OD 2-3/8 in to 4-1/2 in';
    return {
      counts: thick
        ? { tensile: 0, nickBreak: 2, root: 0, face: 0, side: 2 }
        : { tensile: 0, nickBreak: 2, root: 2, face: 0, side: 0 },
      band: `${band}, ${wallText}`,
    };
  }
  if (!over(IN_12_75))
    return {
      counts: thick
        ? { tensile: 2, nickBreak: 2, root: 0, face: 0, side: 2 }
        : { tensile: 2, nickBreak: 2, root: 2, face: 0, side: 0 },
      band: `OD over 4-1/2 in to 12-3/4 in, ${wallText}`,
    };
  return {
    counts: thick
      ? { tensile: 4, nickBreak: 4, root: 0, face: 0, side: 4 }
      : { tensile: 4, nickBreak: 4, root: 2, face: 2, side: 0 },
    band: `OD over 12-3/4 in (323.9 mm), ${wallText}`,
  };
}

function api1104(od: Length | undefined, wall: Length): BendSpecimenProposal {
  if (!od)
    return {
      ...unknown('api-1104'),
      text: 'API 1104 takes the number of specimens from the pipe OD and wall: enter the outside diameter.',
    };
  const { counts, band } = api1104Specimens(od, wall);
  const set: SpecimenSet = (['face', 'root', 'side'] as const)
    .filter((k) => counts[k] > 0)
    .map((k) => ({ kind: k, count: counts[k] }));
  const words = set.map((s) => `${s.count} ${s.kind}`).join(', ');
  return {
    known: true,
    options: [set],
    clause: 'API 1104 welder qualification specimens',
    source: 'from memory: API 1104 welder qualification specimen table (20th/21st editions)',
    text: `${band}: ${words} bend${set.length === 1 && set[0]?.count === 1 ? '' : 's'}, ${counts.nickBreak} nick-break${counts.tensile > 0 ? ` and ${counts.tensile} tensile` : ''} specimens.`,
  };
}

const unknown = (code: CodeId): BendSpecimenProposal => ({
  known: false,
  options: [],
  clause: null,
  source: 'not in Beadroll rules',
  text: `Beadroll has no bend specimen table for ${codeNames[code]}: take the number and kind of specimens from the code.`,
});

/** The bend specimens to propose for a groove coupon; `known: false` where Beadroll has no table. */
export function proposeBendSpecimens(input: BendSpecimenProposalInput): BendSpecimenProposal {
  const p = parseInput(bendSpecimenProposalInputSchema, input);
  if (isFilletTest(p.position))
    throw RulesInputError.field(
      'position',
      'Bend specimens are taken from groove weld coupons; a fillet test is broken and etched instead',
    );
  switch (p.code) {
    case 'asme-ix':
      return asmeIx(p.position, p.depositedThickness);
    case 'aws-d1.1':
      return awsD11(p.form, p.position, p.depositedThickness);
    case 'api-1104':
      return api1104(p.outsideDiameter, p.thickness ?? p.depositedThickness);
    default:
      return unknown(p.code);
  }
}
