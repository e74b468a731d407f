// The joint check against the ranges a coupon qualifies: a table-driven pass over every position row of
// every code, worked examples per product form, and properties (fast-check) that the check never widens
// what qualifiedRanges states and that units change a verdict only across a limit the codes give in two
// systems (1/8 in and 3 mm, 3/4 in and 20 mm, …).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type CodeId } from '../schemas/common.js';
import { type CouponInput } from '../schemas/coupon.js';
import { type Joint } from '../schemas/examination.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { MM_PER_INCH, type Length } from '../units/length.js';
import { jointWithin } from './joint-within.js';
import { positionTables, type PositionTable } from './position-tables.js';
import { weldingPositions, type WeldingPosition } from './positions.js';
import { qualifiedRanges, type QualifiedRanges } from './qualified-ranges.js';
import { type Interval } from './size-ranges.js';

const inch = (value: number): Length => ({ value, unit: 'in' });
const mm = (value: number): Length => ({ value, unit: 'mm' });

// A coupon each code's tables accept, per form: its thickness and OD sit inside what it qualifies.
const COUPONS: Record<CodeId, { plate?: CouponInput; pipe: CouponInput }> = {
  'asme-ix': {
    plate: {
      code: 'asme-ix',
      process: 'SMAW',
      form: 'plate',
      weld: 'groove',
      position: '1G',
      thickness: inch(0.375),
      backing: false,
      fNumber: 4,
    },
    pipe: {
      code: 'asme-ix',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '1G',
      thickness: inch(0.432),
      outsideDiameter: inch(6.625),
      backing: false,
      fNumber: 4,
    },
  },
  'aws-d1.1': {
    plate: {
      code: 'aws-d1.1',
      process: 'SMAW',
      form: 'plate',
      weld: 'groove',
      position: '1G',
      thickness: inch(0.375),
      backing: false,
      fNumber: 4,
    },
    pipe: {
      code: 'aws-d1.1',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '1G',
      thickness: inch(0.562),
      outsideDiameter: inch(6.625),
      backing: false,
      fNumber: 4,
    },
  },
  'api-1104': {
    pipe: {
      code: 'api-1104',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '1G',
      thickness: inch(0.28),
      outsideDiameter: inch(6.625),
      backing: false,
      fNumber: 3,
    },
  },
  'iso-9606-1': {
    plate: {
      code: 'iso-9606-1',
      process: 'SMAW',
      form: 'plate',
      weld: 'groove',
      position: '1G',
      thickness: mm(8),
      backing: false,
      fNumber: 4,
    },
    pipe: {
      code: 'iso-9606-1',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '1G',
      thickness: mm(8),
      outsideDiameter: mm(168.3),
      backing: false,
      fNumber: 4,
    },
  },
};

type Row = {
  code: CodeId;
  form: 'plate' | 'pipe';
  position: string;
  groove: WeldingPosition[];
  fillet: WeldingPosition[];
};

function rowsOf(code: CodeId, form: 'plate' | 'pipe', table: PositionTable): Row[] {
  return Object.entries(table).map(([position, row]) => ({
    code,
    form,
    position,
    groove: row.groove,
    fillet: row.fillet,
  }));
}

const ROWS: Row[] = (Object.keys(positionTables) as CodeId[]).flatMap((code) =>
  (['plate', 'pipe'] as const).flatMap((form) => rowsOf(code, form, positionTables[code][form])),
);

function jointFor(
  c: CouponInput,
  weld: 'groove' | 'fillet',
  position: WeldingPosition,
  form: 'plate' | 'pipe',
  od?: Length,
): Joint {
  return {
    form,
    weld,
    position,
    thickness: c.thickness,
    ...(form === 'pipe' ? { outsideDiameter: od ?? c.outsideDiameter } : {}),
    ...(c.fNumber !== undefined ? { fNumber: c.fNumber } : {}),
    backing: false,
    progression: 'uphill',
  };
}

describe('jointWithin over every position row of every code (table-driven)', () => {
  it.each(ROWS.map((r) => [r.code, r.form, r.position, r]))(
    'from memory: QW-461.9, AWS D1.1-2015 Table 4.10, API 1104 and ISO 9606-1 position tables — %s %s %s',
    (_code, _form, _position, row) => {
      const r = row;
      const base = COUPONS[r.code][r.form];
      if (!base) return;
      const fillet = !r.position.includes('G');
      const coupon: CouponInput = {
        ...base,
        position: r.position,
        weld: fillet ? 'fillet' : 'groove',
        progression: 'uphill',
      };
      const ranges = qualifiedRanges(coupon);
      // the joint in the coupon's own form (plate, or pipe of the coupon's OD)
      for (const weld of ['groove', 'fillet'] as const)
        for (const p of weldingPositions) {
          const expected = (weld === 'groove' ? r.groove : r.fillet).includes(p);
          const smallPipeGroove = r.code === 'asme-ix' && r.form === 'plate' && weld === 'groove';
          // ASME plate groove on pipe up to 24 in OD: F (and H with 2G) only
          const onSmallPipe = smallPipeGroove
            ? expected && (p === 'F' || (p === 'H' && r.position.includes('2G')))
            : expected;
          const form = r.form;
          const od = r.form === 'plate' ? undefined : base.outsideDiameter;
          expect(
            jointWithin(ranges, jointFor(base, weld, p, form, od)).within,
            `${weld} ${p} on ${form}`,
          ).toBe(expected);
          if (r.form === 'plate' && r.code === 'asme-ix') {
            expect(
              jointWithin(ranges, jointFor(base, weld, p, 'pipe', inch(6.625))).within,
              `${weld} ${p} on 6-5/8 in pipe`,
            ).toBe(onSmallPipe);
            expect(
              jointWithin(ranges, jointFor(base, weld, p, 'pipe', inch(30))).within,
              `${weld} ${p} on 30 in pipe`,
            ).toBe(expected);
          }
        }
    },
  );
});

describe('jointWithin worked examples', () => {
  const asme = qualifiedRanges({ ...COUPONS['asme-ix'].plate!, position: '2G' });

  it('from memory: QW-461.9 — a 2G plate test: H groove on plate and on 30 in pipe yes, V no; on 6 in pipe F and H', () => {
    expect(
      jointWithin(asme, {
        form: 'plate',
        weld: 'groove',
        position: 'H',
        thickness: inch(0.5),
        fNumber: 4,
        backing: true,
      }).within,
    ).toBe(true);
    const v = jointWithin(asme, {
      form: 'plate',
      weld: 'groove',
      position: 'V',
      thickness: inch(0.5),
      fNumber: 4,
      backing: true,
      progression: 'uphill',
    });
    expect(v.within).toBe(false);
    expect(v.reasons[0]).toMatchObject({ variable: 'position', clause: 'QW-461.9' });
  });

  it('from memory: QW-404.14 — autogenous GTAW qualifies welding without filler metal only, and a filler test does not qualify autogenous welding', () => {
    const joint = {
      form: 'plate',
      weld: 'groove',
      position: 'F',
      thickness: inch(0.1),
      backing: true,
    } as const;
    const auto = qualifiedRanges({
      ...COUPONS['asme-ix'].plate!,
      process: 'GTAW',
      fNumber: undefined,
      withoutFiller: true,
      thickness: inch(0.125),
    });
    expect(jointWithin(auto, { ...joint, withoutFiller: true }).within).toBe(true);
    const filler = jointWithin(auto, { ...joint, fNumber: 6 });
    expect(filler.within).toBe(false);
    expect(filler.reasons[0]).toMatchObject({ variable: 'fNumber', clause: 'QW-404.14' });
    expect(filler.reasons[0]?.message).toMatch(/without filler metal only/);
    const withFiller = qualifiedRanges({
      ...COUPONS['asme-ix'].plate!,
      process: 'GTAW',
      fNumber: 6,
      thickness: inch(0.125),
    });
    const autoJoint = jointWithin(withFiller, { ...joint, withoutFiller: true });
    expect(autoJoint.within).toBe(false);
    expect(autoJoint.reasons[0]).toMatchObject({ variable: 'fNumber', clause: 'QW-404.14' });
  });

  it('from memory: QW-452.1(b) — groove thickness up to 2t; QW-303.1 — fillets any thickness', () => {
    const over = jointWithin(asme, {
      form: 'plate',
      weld: 'groove',
      position: 'F',
      thickness: inch(0.76),
      fNumber: 4,
      backing: true,
    });
    expect(over.within).toBe(false);
    expect(over.reasons[0]).toMatchObject({ variable: 'thickness', clause: 'QW-452.1(b), QW-404.30' });
    expect(over.reasons[0]?.message).toBe(
      'Weld metal thickness 0.76 in is above the qualified range (up to 3/4 in).',
    );
    expect(
      jointWithin(asme, {
        form: 'plate',
        weld: 'fillet',
        position: 'H',
        thickness: inch(2),
        fNumber: 4,
        backing: false,
      }).within,
    ).toBe(true);
  });

  it('from memory: QW-433 and QW-402.4 — F-No. 5 is not qualified by F-No. 4; a groove without backing needs a test without backing', () => {
    const withBacking = qualifiedRanges({ ...COUPONS['asme-ix'].plate!, backing: true });
    const r = jointWithin(withBacking, {
      form: 'plate',
      weld: 'groove',
      position: 'F',
      thickness: inch(0.5),
      fNumber: 5,
      backing: false,
    });
    expect(r.reasons.map((x) => x.variable)).toEqual(['fNumber', 'backing']);
  });

  it('from memory: QW-405.3 and QW-409.2 — progression and transfer mode must match', () => {
    const gmaw = qualifiedRanges({
      ...COUPONS['asme-ix'].plate!,
      process: 'GMAW',
      transferMode: 'spray',
      fNumber: 6,
      position: '3G',
      progression: 'uphill',
    });
    const j: Joint = {
      form: 'plate',
      weld: 'groove',
      position: 'V',
      thickness: inch(0.5),
      fNumber: 6,
      backing: false,
      progression: 'downhill',
      transferMode: 'short-circuit',
    };
    expect(jointWithin(gmaw, j).reasons.map((x) => x.variable)).toEqual(['progression', 'transferMode']);
    expect(jointWithin(gmaw, { ...j, progression: 'uphill', transferMode: 'pulse' }).within).toBe(true);
  });

  it('refuses a joint that is not one, naming the field', () => {
    expect(
      fieldsThrown(() =>
        jointWithin(asme, {
          form: 'plate',
          weld: 'groove',
          position: 'X',
          thickness: inch(0.5),
          backing: true,
        } as unknown as Joint),
      ),
    ).toEqual(['position']);
  });
});

// ---- properties ---------------------------------------------------------------------------------

const arbCoupon: fc.Arbitrary<CouponInput> = fc
  .record({
    code: fc.constantFrom<CodeId>('asme-ix', 'iso-9606-1'),
    form: fc.constantFrom<'plate' | 'pipe'>('plate', 'pipe'),
    weld: fc.constantFrom<'groove' | 'fillet'>('groove', 'fillet'),
    thicknessIn: fc.double({ min: 0.05, max: 1.5, noNaN: true }),
    odIn: fc.double({ min: 0.5, max: 40, noNaN: true }),
    backing: fc.boolean(),
    fNumber: fc.constantFrom(1, 2, 3, 4, 5, 6, 21, 43),
    layers: fc.integer({ min: 1, max: 6 }),
    progression: fc.constantFrom<'uphill' | 'downhill'>('uphill', 'downhill'),
    unit: fc.constantFrom<'in' | 'mm'>('in', 'mm'),
    groovePos: fc.constantFrom('1G', '2G', '3G', '4G', '3G+4G'),
    pipePos: fc.constantFrom('1G', '2G', '5G', '6G', '2G+5G'),
    filletPos: fc.constantFrom('1F', '2F', '4F'),
  })
  .map((g) => {
    const len = (v: number): Length =>
      g.unit === 'in' ? inch(Number(v.toFixed(4))) : mm(Number((v * MM_PER_INCH).toFixed(2)));
    const position = g.weld === 'fillet' ? g.filletPos : g.form === 'pipe' ? g.pipePos : g.groovePos;
    return {
      code: g.code,
      process: 'SMAW' as const,
      form: g.form,
      weld: g.weld,
      position,
      thickness: len(g.thicknessIn),
      ...(g.form === 'pipe' ? { outsideDiameter: len(Math.max(g.odIn, g.thicknessIn * 2.5)) } : {}),
      backing: g.backing,
      fNumber: g.fNumber,
      layers: g.layers,
      progression: g.progression,
    };
  });

const arbJoint: fc.Arbitrary<Joint> = fc
  .record({
    form: fc.constantFrom<'plate' | 'pipe'>('plate', 'pipe'),
    weld: fc.constantFrom<'groove' | 'fillet'>('groove', 'fillet'),
    position: fc.constantFrom<WeldingPosition>('F', 'H', 'V', 'O'),
    thicknessIn: fc.double({ min: 0.02, max: 4, noNaN: true }),
    odIn: fc.double({ min: 0.5, max: 48, noNaN: true }),
    fNumber: fc.constantFrom(1, 2, 3, 4, 5, 6, 21, 22, 43, 61),
    backing: fc.boolean(),
    progression: fc.constantFrom<'uphill' | 'downhill'>('uphill', 'downhill'),
    unit: fc.constantFrom<'in' | 'mm'>('in', 'mm'),
  })
  .map((g) => {
    const len = (v: number): Length => (g.unit === 'in' ? inch(v) : mm(v * MM_PER_INCH));
    return {
      form: g.form,
      weld: g.weld,
      position: g.position,
      thickness: len(g.thicknessIn),
      ...(g.form === 'pipe' ? { outsideDiameter: len(g.odIn) } : {}),
      fNumber: g.fNumber,
      backing: g.backing,
      progression: g.progression,
    };
  });

const toIn = (l: Length) => (l.unit === 'in' ? l.value : l.value / MM_PER_INCH);
/** An independent reading of an interval, in inches with a small tolerance. */
const inside = (l: Length, iv: Interval) => {
  const v = toIn(l);
  const tol = 1e-6;
  if (iv.min && (iv.minExclusive ? v <= toIn(iv.min) - tol : v < toIn(iv.min) - tol)) return false;
  if (iv.max && (iv.maxExclusive ? v >= toIn(iv.max) + tol : v > toIn(iv.max) + tol)) return false;
  return true;
};

const rangesOrNull = (c: CouponInput): QualifiedRanges | null => {
  try {
    return qualifiedRanges(c);
  } catch {
    return null;
  }
};

const converted = (l: Length): Length =>
  l.unit === 'in' ? mm(l.value * MM_PER_INCH) : inch(l.value / MM_PER_INCH);
const nearEnd = (l: Length, iv: Interval) =>
  [iv.min, iv.max].some((e) => e !== null && Math.abs(toIn(e) - toIn(l)) <= 1e-6 * Math.max(1, toIn(e)));

describe('jointWithin properties', () => {
  it('property: a joint found within is inside every limit qualifiedRanges states (never wider)', () => {
    fc.assert(
      fc.property(arbCoupon, arbJoint, (c, j) => {
        const r = rangesOrNull(c);
        fc.pre(r !== null);
        const rr = r;
        if (!jointWithin(rr, j).within) return;
        const fillet = j.weld === 'fillet';
        const groovePositions =
          j.form === 'pipe' && toIn(j.outsideDiameter!) <= 24 && rr.grooveOnPipeUpTo24
            ? rr.grooveOnPipeUpTo24
            : rr.positions.groove;
        expect((fillet ? rr.positions.fillet : groovePositions).includes(j.position)).toBe(true);
        expect(rr.positions[fillet ? 'fillet' : 'groove'].includes(j.position)).toBe(true);
        expect(inside(j.thickness, fillet ? rr.fillet.thickness : rr.thickness)).toBe(true);
        if (j.form === 'pipe')
          expect(inside(j.outsideDiameter!, fillet ? rr.fillet.diameter : rr.diameter)).toBe(true);
        expect(rr.fNumbers.includes(j.fNumber!)).toBe(true);
        if (!fillet) expect(rr.backing.includes(j.backing ? 'with' : 'without')).toBe(true);
        if (j.position === 'V') expect(rr.progression?.includes(j.progression!)).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('property: the same joint written in the other unit gets the same verdict (away from an interval end)', () => {
    fc.assert(
      fc.property(arbCoupon, arbJoint, (c, j) => {
        const r = rangesOrNull(c);
        fc.pre(r !== null);
        const rr = r;
        const fillet = j.weld === 'fillet';
        fc.pre(!nearEnd(j.thickness, fillet ? rr.fillet.thickness : rr.thickness));
        fc.pre(!j.outsideDiameter || !nearEnd(j.outsideDiameter, fillet ? rr.fillet.diameter : rr.diameter));
        const other: Joint = {
          ...j,
          thickness: converted(j.thickness),
          ...(j.outsideDiameter ? { outsideDiameter: converted(j.outsideDiameter) } : {}),
        };
        expect(jointWithin(rr, other).within).toBe(jointWithin(rr, j).within);
      }),
      { numRuns: 3000 },
    );
  });

  it('property: a coupon recorded in the other unit changes a verdict only where the joint lies between the two values a code gives for one limit (e.g. 1/8 in and 3 mm)', () => {
    // the limits the codes state in both systems, in inches and in millimetres (from memory: QW-452,
    // D1.1-2015 Table 4.11, ISO 9606-1); 2t and 1.1t of a converted coupon are the same size in both
    const pairs = [
      [1 / 8, 3],
      [3 / 16, 5],
      [3 / 8, 10],
      [1 / 2, 13],
      [3 / 4, 20],
      [1, 25],
      [2.875, 73],
      [4, 100],
      [24, 600],
      [24, 610],
    ];
    const between = (l: Length | undefined) =>
      l !== undefined &&
      pairs.some(([i, m]) => {
        const a = i! * MM_PER_INCH;
        const b = m!;
        const v = l.unit === 'in' ? l.value * MM_PER_INCH : l.value;
        return v >= Math.min(a, b) * (1 - 1e-4) && v <= Math.max(a, b) * (1 + 1e-4);
      });
    fc.assert(
      fc.property(arbCoupon, arbJoint, (c, j) => {
        const r1 = rangesOrNull(c);
        const other: CouponInput = {
          ...c,
          thickness: converted(c.thickness),
          ...(c.outsideDiameter ? { outsideDiameter: converted(c.outsideDiameter) } : {}),
        };
        const r2 = rangesOrNull(other);
        fc.pre(r1 !== null && r2 !== null);
        // the coupon itself away from a two-system limit, the joint away from one and from every end
        fc.pre(!between(c.thickness) && !between(c.outsideDiameter));
        fc.pre(!between(j.thickness) && !between(j.outsideDiameter));
        for (const rr of [r1, r2]) {
          fc.pre(!nearEnd(j.thickness, rr.thickness) && !nearEnd(j.thickness, rr.fillet.thickness));
          if (j.outsideDiameter)
            fc.pre(
              !nearEnd(j.outsideDiameter, rr.diameter) && !nearEnd(j.outsideDiameter, rr.fillet.diameter),
            );
        }
        expect(jointWithin(r2, j).within).toBe(jointWithin(r1, j).within);
      }),
      { numRuns: 3000 },
    );
  });
});
