// The bend specimens a coupon calls for, so the coupon form can propose the right set (TRADE.md §2).
import { bendSpecimenProposalInputSchema, type BendSpecimenProposalInput } from '../schemas/coupon.js';
import { type CodeId } from '../schemas/common.js';
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

function asmeIx(position: TestPosition, t: Length): BendSpecimenProposal {
  const parts = splitTestPosition(position);
  const pipeFixed = parts.some((p) => p === '5G' || p === '6G');
  // 5G and 6G pipe coupons take four bends; a 2G + 5G coupon six (QW-452.1(a))
  const pairs = position === '2G+5G' ? 3 : pipeFixed ? 2 : 1;
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
    text: `Deposited weld metal ${tText}, ${band}; ${2 * pairs} specimens in all for ${position}.`,
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
  return below(t, IN_1)
    ? {
        known: true,
        options: [faceRoot(1), side(2)],
        clause,
        source,
        text: `Plate of ${formatLength(t)} (the 3/8 in test plate): one face and one root bend, or two side bends.`,
      }
    : {
        known: true,
        options: [side(2)],
        clause,
        source,
        text: `Plate of ${formatLength(t)} (the 1 in test plate): two side bends.`,
      };
}

const unknown = (code: CodeId): BendSpecimenProposal => ({
  known: false,
  options: [],
  clause: null,
  source: 'not in Beadroll rules',
  text: `Beadroll has no bend specimen table for ${code}: take the number and kind of specimens from the code.`,
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
    default:
      return unknown(p.code);
  }
}
