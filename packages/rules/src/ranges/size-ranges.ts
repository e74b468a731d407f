// Thickness and pipe diameter qualified by a coupon, per code (TRADE.md §4). Thresholds are dual sizes
// (the inch value and the SI value the code gives) so a coupon measured in mm is judged on the SI value.
import { type Coupon } from '../schemas/coupon.js';
import { pipeDimensions } from '../pipes/pipe-dimensions.js';
import {
  dualAs,
  exceeds,
  formatLength,
  limitIn,
  toInches,
  type DualSize,
  type Length,
} from '../units/length.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { type LimitSource } from './position-tables.js';

export type RangeLimit = { variable: string; clause: string; text: string; source: LimitSource };
export type Interval = {
  min: Length | null;
  max: Length | null;
  minExclusive: boolean;
  maxExclusive: boolean;
};
/** fillet: what the coupon qualifies for fillet welds (a groove test: no limit under QW-303.1). */
export type SizeRanges = {
  thickness: Interval;
  diameter: Interval;
  fillet: { thickness: Interval; diameter: Interval };
  limits: RangeLimit[];
};

const interval = (
  min: Length | null,
  max: Length | null,
  minExclusive = false,
  maxExclusive = false,
): Interval => ({
  min,
  max,
  minExclusive,
  maxExclusive,
});
const times = (l: Length, k: number): Length => ({ value: Number((l.value * k).toFixed(6)), unit: l.unit });
const fmt = (l: Length): string => formatLength(l, { digits: l.unit === 'mm' ? 2 : 3 });
const below = (l: Length, limit: DualSize): boolean => exceeds(limitIn(limit, l.unit), l.value);

const IN_1_8: DualSize = { in: 1 / 8, mm: 3 };
const IN_3_16: DualSize = { in: 3 / 16, mm: 5 };
const IN_3_8: DualSize = { in: 3 / 8, mm: 10 };
const IN_1_2: DualSize = { in: 1 / 2, mm: 13 };
const IN_3_4: DualSize = { in: 3 / 4, mm: 20 };
const IN_1: DualSize = { in: 1, mm: 25 };
const IN_2_7_8: DualSize = { in: 2.875, mm: 73 };
const IN_4: DualSize = { in: 4, mm: 100 };
const IN_24: DualSize = { in: 24, mm: 600 };

/** The thickness a rule is based on: the weld metal this welder deposited with the process, else the coupon's. */
function depositBasis(c: Coupon): { t: Length; text: string } {
  if (c.depositedThickness)
    return { t: c.depositedThickness, text: `deposited weld metal t = ${fmt(c.depositedThickness)}` };
  return {
    t: c.thickness,
    text: `t = ${fmt(c.thickness)} (no deposited thickness given: the whole coupon thickness is taken as deposited by this welder and process)`,
  };
}

// ---- ASME IX ----------------------------------------------------------------------------------------

function asmeIx(c: Coupon): SizeRanges {
  const limits: RangeLimit[] = [];
  let thickness: Interval;
  if (c.weld === 'fillet') {
    thickness = interval(null, null);
    limits.push({
      variable: 'thickness',
      clause: 'QW-452.5',
      text: 'A fillet weld test qualifies fillet welds on all base metal thicknesses and all fillet sizes.',
      source: 'from-memory',
    });
  } else {
    const { t, text } = depositBasis(c);
    const shortCircuit = c.process === 'GMAW' && c.transferMode === 'short-circuit';
    if (!below(t, IN_1_2) && (c.layers ?? 0) >= 3) {
      thickness = interval(null, null);
      limits.push({
        variable: 'thickness',
        clause: 'QW-452.1(b)',
        text: `${text}: 1/2 in (13 mm) or more, welded in ${c.layers} layers, qualifies the maximum to be welded (no upper limit).`,
        source: 'from-memory',
      });
    } else if (shortCircuit && below(t, IN_1_2)) {
      thickness = interval(null, times(t, 1.1));
      limits.push({
        variable: 'thickness',
        clause: 'QW-404.32',
        text: `GMAW short-circuit transfer with ${text}, under 1/2 in (13 mm): qualifies up to 1.1t = ${fmt(times(t, 1.1))}.`,
        source: 'from-memory',
      });
    } else {
      thickness = interval(null, times(t, 2));
      const more = below(t, IN_1_2)
        ? ''
        : ` With at least three layers this deposit would qualify the maximum to be welded; ${c.layers === undefined ? 'the number of layers was not given' : `only ${c.layers} were welded`}.`;
      limits.push({
        variable: 'thickness',
        clause: 'QW-452.1(b), QW-404.30',
        text: `${text}: qualifies deposited weld metal up to 2t = ${fmt(times(t, 2))}.${more}`,
        source: 'from-memory',
      });
    }
    limits.push({
      variable: 'thickness',
      clause: 'QW-452.1(b)',
      text: 'No minimum thickness applies to groove welds in performance qualification.',
      source: 'from-memory',
    });
  }
  const { diameter, limit } = asmeDiameter(c);
  limits.push(limit);
  if (c.weld === 'fillet') return { thickness, diameter, fillet: { thickness, diameter }, limits };
  limits.push({
    variable: 'fillet',
    clause: 'QW-303.1',
    text: 'Fillet welds: a groove test qualifies fillet welds in all base metal thicknesses, fillet sizes and pipe diameters (the groove limits above do not apply to them).',
    source: 'from-memory',
  });
  return {
    thickness,
    diameter,
    fillet: { thickness: interval(null, null), diameter: interval(null, null) },
    limits,
  };
}

function asmeDiameter(c: Coupon): { diameter: Interval; limit: RangeLimit } {
  const clause = c.weld === 'fillet' ? 'QW-452.4, QW-452.5' : 'QW-452.3, QW-303.1';
  if (c.form === 'plate') {
    const min = dualAs(IN_2_7_8, c.thickness.unit);
    return {
      diameter: interval(min, null),
      limit: {
        variable: 'diameter',
        clause,
        text: `A plate coupon qualifies pipe of ${fmt(min)} OD and over.`,
        source: 'from-memory',
      },
    };
  }
  const od = requireOd(c);
  if (below(od, IN_1))
    return {
      diameter: interval(od, null),
      limit: {
        variable: 'diameter',
        clause,
        text: `Coupon OD ${fmt(od)} is under 1 in (25 mm): qualifies the size welded and over.`,
        source: 'from-memory',
      },
    };
  const min = dualAs(exceeds(od.value, limitIn(IN_2_7_8, od.unit)) ? IN_2_7_8 : IN_1, od.unit);
  const band = exceeds(od.value, limitIn(IN_2_7_8, od.unit))
    ? 'over 2-7/8 in (73 mm)'
    : '1 in (25 mm) to 2-7/8 in (73 mm)';
  return {
    diameter: interval(min, null),
    limit: {
      variable: 'diameter',
      clause,
      text: `Coupon OD ${fmt(od)} is ${band}: qualifies pipe of ${fmt(min)} OD and over.`,
      source: 'from-memory',
    },
  };
}

function requireOd(c: Coupon): Length {
  if (!c.outsideDiameter)
    throw RulesInputError.field('outsideDiameter', 'Enter the outside diameter of the pipe coupon');
  return c.outsideDiameter;
}

// ---- AWS D1.1 ---------------------------------------------------------------------------------------

const AWS_TABLE = 'AWS D1.1 Table 4.11 (2015)';

// The standard test pipes of the welder qualification table; job-size pipe tests qualify differently.
const awsStandardPipes = [
  { nps: '2', schedule: '80', small: true },
  { nps: '3', schedule: '40', small: true },
  { nps: '6', schedule: '120', small: false },
  { nps: '8', schedule: '80', small: false },
].map((p) => ({ ...p, ...pipeDimensions(p.nps, p.schedule) }));

const near = (a: Length, b: Length, tolIn: number): boolean => Math.abs(toInches(a) - toInches(b)) <= tolIn;

function awsD11(c: Coupon): SizeRanges {
  const u = c.thickness.unit;
  if (c.weld === 'fillet') {
    const diameter =
      c.form === 'plate'
        ? {
            d: interval(dualAs(IN_24, u), null),
            text: 'A plate test qualifies pipe of 24 in (600 mm) OD and over.',
            source: 'from-memory' as const,
          }
        : {
            d: interval(requireOd(c), null),
            text: `Pipe fillet test: pipe of the size tested (${fmt(requireOd(c))}) and over.`,
            source: 'beadroll-default' as const,
          };
    const filletThickness = interval(dualAs(IN_1_8, u), null);
    return {
      thickness: filletThickness,
      diameter: diameter.d,
      fillet: { thickness: filletThickness, diameter: diameter.d },
      limits: [
        {
          variable: 'thickness',
          clause: AWS_TABLE,
          text: 'A fillet weld test qualifies 1/8 in (3 mm) and thicker base metal.',
          source: 'from-memory',
        },
        { variable: 'diameter', clause: AWS_TABLE, text: diameter.text, source: diameter.source },
      ],
    };
  }
  if (c.form === 'plate') {
    const T = c.thickness;
    if (below(T, IN_3_8))
      throw RulesInputError.field(
        'thickness',
        'AWS D1.1 groove test plates are 3/8 in (10 mm) or 1 in (25 mm) thick',
      );
    const unlimited = !below(T, IN_1);
    // 3/8 in plate: 1/8 in to 3/4 in; over 3/8 in and under 1 in: 1/8 in to 2T; 1 in: no upper limit
    const atThreeEighths = !exceeds(T.value, limitIn(IN_3_8, u));
    const max = unlimited ? null : atThreeEighths ? dualAs(IN_3_4, u) : times(T, 2);
    const limits: RangeLimit[] = [
      {
        variable: 'thickness',
        clause: AWS_TABLE,
        text: unlimited
          ? `A test plate of ${fmt(T)} (1 in, 25 mm, or more) qualifies 1/8 in (3 mm) and over, no upper limit.`
          : atThreeEighths
            ? `A test plate of ${fmt(T)} (the 3/8 in, 10 mm, test plate) qualifies 1/8 in (3 mm) to 3/4 in (20 mm).`
            : `A test plate of ${fmt(T)} (over 3/8 in, under 1 in) qualifies 1/8 in (3 mm) to 2T = ${fmt(times(T, 2))}.`,
        source: 'from-memory',
      },
      {
        variable: 'fillet',
        clause: AWS_TABLE,
        text: 'Fillet welds: a groove test qualifies fillet welds on 1/8 in (3 mm) and thicker base metal, no upper limit.',
        source: 'from-memory',
      },
      {
        variable: 'diameter',
        clause: AWS_TABLE,
        text: 'A plate groove test qualifies pipe of 24 in (600 mm) OD and over.',
        source: 'from-memory',
      },
    ];
    const diameter = interval(dualAs(IN_24, u), null);
    return {
      thickness: interval(dualAs(IN_1_8, u), max),
      diameter,
      fillet: { thickness: interval(dualAs(IN_1_8, u), null), diameter },
      limits,
    };
  }
  const od = requireOd(c);
  const std = awsStandardPipes.find(
    (p) => near(od, p.outsideDiameter, 0.02) && near(c.thickness, p.wall, 0.006),
  );
  if (!std)
    throw RulesInputError.field(
      'outsideDiameter',
      'For AWS D1.1 pipe tests Beadroll computes ranges for the standard test pipes only (NPS 2 Sch 80, NPS 3 Sch 40, NPS 6 Sch 120, NPS 8 Sch 80); record a job-size test range from the code',
    );
  const name = `NPS ${std.nps} Sch ${std.schedule}`;
  const sized: Omit<SizeRanges, 'fillet'> = std.small
    ? {
        thickness: interval(dualAs(IN_1_8, u), dualAs(IN_3_4, u)),
        diameter: interval(dualAs({ in: 3 / 4, mm: 20 }, od.unit), dualAs(IN_4, od.unit)),
        limits: [
          {
            variable: 'thickness',
            clause: AWS_TABLE,
            text: `Standard test pipe ${name}: wall 1/8 in (3 mm) to 3/4 in (20 mm).`,
            source: 'from-memory',
          },
          {
            variable: 'diameter',
            clause: AWS_TABLE,
            text: `Standard test pipe ${name}: OD 3/4 in (20 mm) to 4 in (100 mm).`,
            source: 'from-memory',
          },
        ],
      }
    : {
        thickness: interval(dualAs(IN_3_16, u), null),
        diameter: interval(dualAs(IN_4, od.unit), null),
        limits: [
          {
            variable: 'thickness',
            clause: AWS_TABLE,
            text: `Standard test pipe ${name}: wall 3/16 in (5 mm) and over.`,
            source: 'from-memory',
          },
          {
            variable: 'diameter',
            clause: AWS_TABLE,
            text: `Standard test pipe ${name}: OD 4 in (100 mm) and over.`,
            source: 'from-memory',
          },
        ],
      };
  return {
    ...sized,
    fillet: { thickness: interval(dualAs(IN_1_8, u), null), diameter: sized.diameter },
    limits: [
      ...sized.limits,
      {
        variable: 'fillet',
        clause: AWS_TABLE,
        text: 'Fillet welds: 1/8 in (3 mm) and thicker base metal, no upper limit; the diameter range of the groove test.',
        source: 'from-memory',
      },
    ],
  };
}

// ---- API 1104 ---------------------------------------------------------------------------------------

const API_SINGLE = 'API 1104 single qualification';

function groupOf(
  value: Length,
  lower: DualSize,
  upper: DualSize,
  what: string,
  unitWord: string,
): { range: Interval; text: string } {
  const lo = dualAs(lower, value.unit);
  const hi = dualAs(upper, value.unit);
  if (below(value, lower))
    return {
      range: interval(null, lo, false, true),
      text: `${what} ${fmt(value)} is in the group under ${fmt(lo)}: qualified for ${unitWord} under ${fmt(lo)} only.`,
    };
  if (exceeds(value.value, hi.value))
    return {
      range: interval(hi, null, true, false),
      text: `${what} ${fmt(value)} is in the group over ${fmt(hi)}: qualified for ${unitWord} over ${fmt(hi)} only.`,
    };
  return {
    range: interval(lo, hi),
    text: `${what} ${fmt(value)} is in the group ${fmt(lo)} to ${fmt(hi)}: qualified within that group only.`,
  };
}

function api1104(c: Coupon): SizeRanges {
  // plate coupons were refused with the positions (API 1104 has no plate test positions)
  const od = groupOf(
    requireOd(c),
    { in: 2.375, mm: 60.3 },
    { in: 12.75, mm: 323.9 },
    'Coupon OD',
    'outside diameters',
  );
  const wall = groupOf(c.thickness, { in: 0.188, mm: 4.8 }, { in: 0.75, mm: 19.1 }, 'Coupon wall', 'walls');
  return {
    thickness: wall.range,
    diameter: od.range,
    fillet: { thickness: wall.range, diameter: od.range },
    limits: [
      { variable: 'thickness', clause: API_SINGLE, text: wall.text, source: 'from-memory' },
      { variable: 'diameter', clause: API_SINGLE, text: od.text, source: 'from-memory' },
    ],
  };
}

// ---- ISO 9606-1 -------------------------------------------------------------------------------------

const ISO_DIMENSIONS = 'ISO 9606-1 material thickness and outside diameter';

function iso96061(c: Coupon): SizeRanges {
  const { t, text } = depositBasis(c);
  const u = t.unit;
  const mm3 = dualAs({ mm: 3 }, u);
  let thickness: Interval;
  let thicknessText: string;
  if (c.weld === 'fillet') {
    thickness = below(t, { mm: 3 }) ? interval(t, mm3) : interval(mm3, null);
    thicknessText = below(t, { mm: 3 })
      ? `Fillet test, ${text}, under 3 mm: qualifies t to 3 mm.`
      : `Fillet test, ${text}, 3 mm or more: qualifies 3 mm and over.`;
  } else {
    // oxyfuel welding (311) qualifies up to 1.5t, the arc processes up to 2t
    const k = c.process === 'OFW' ? 1.5 : 2;
    if (below(t, { mm: 3 })) {
      thickness = interval(t, times(t, k));
      thicknessText = `Butt weld, ${text}, under 3 mm: qualifies t to ${k}t = ${fmt(times(t, k))}.`;
    } else if (below(t, { mm: 12 })) {
      thickness = interval(mm3, times(t, k));
      thicknessText = `Butt weld, ${text}, 3 mm to under 12 mm: qualifies 3 mm to ${k}t = ${fmt(times(t, k))}.`;
    } else {
      thickness = interval(dualAs({ mm: 5 }, u), null);
      thicknessText = `Butt weld, ${text}, 12 mm or more: qualifies 5 mm and over.`;
    }
  }
  let diameter: Interval;
  let diameterText: string;
  if (c.form === 'plate') {
    diameter = interval(dualAs({ mm: 500 }, u), null);
    diameterText = 'A plate test qualifies pipe of 500 mm OD and over.';
  } else {
    const D = requireOd(c);
    if (!exceeds(D.value, limitIn({ mm: 25 }, D.unit))) {
      diameter = interval(D, times(D, 2));
      diameterText = `Pipe OD D = ${fmt(D)}, 25 mm or less: qualifies D to 2D = ${fmt(times(D, 2))}.`;
    } else {
      const half = times(D, 0.5);
      const min = below(half, { mm: 25 }) ? dualAs({ mm: 25 }, D.unit) : half;
      diameter = interval(min, null);
      diameterText = `Pipe OD D = ${fmt(D)}, over 25 mm: qualifies 0.5D and over, at least 25 mm (${fmt(min)} and over).`;
    }
  }
  return {
    thickness,
    diameter,
    fillet: { thickness, diameter },
    limits: [
      { variable: 'thickness', clause: ISO_DIMENSIONS, text: thicknessText, source: 'from-memory' },
      { variable: 'diameter', clause: ISO_DIMENSIONS, text: diameterText, source: 'from-memory' },
    ],
  };
}

export const sizeRanges: Record<Coupon['code'], (c: Coupon) => SizeRanges> = {
  'asme-ix': asmeIx,
  'aws-d1.1': awsD11,
  'api-1104': api1104,
  'iso-9606-1': iso96061,
};
