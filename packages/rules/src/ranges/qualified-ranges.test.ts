import { describe, expect, it } from 'vitest';
import { type CouponInput } from '../schemas/coupon.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { qualifiedRanges } from './qualified-ranges.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const mm = (value: number) => ({ value, unit: 'mm' as const });

const plate = (more: Partial<CouponInput> = {}): CouponInput => ({
  code: 'asme-ix',
  process: 'SMAW',
  form: 'plate',
  weld: 'groove',
  position: '1G',
  thickness: inch(0.375),
  backing: true,
  fNumber: 4,
  ...more,
});
const pipe = (more: Partial<CouponInput> = {}): CouponInput =>
  plate({ form: 'pipe', position: '1G', outsideDiameter: inch(6.625), thickness: inch(0.28), ...more });

const fieldOf = fieldsThrown;

describe('positions (TRADE.md §3)', () => {
  it.each([
    ['1G', ['F'], ['F']],
    ['2G', ['F', 'H'], ['F', 'H']],
    ['3G', ['F', 'V'], ['F', 'H', 'V']],
    ['4G', ['F', 'O'], ['F', 'H', 'O']],
    ['3G+4G', ['F', 'V', 'O'], ['F', 'H', 'V', 'O']],
  ])('from memory: QW-461.9 — ASME plate %s qualifies groove %j, fillet %j', (position, groove, fillet) => {
    const r = qualifiedRanges(plate({ position, progression: 'uphill' }));
    expect(r.positions).toEqual({ groove, fillet });
  });

  it.each([
    ['1G', ['F'], ['F']],
    ['2G', ['F', 'H'], ['F', 'H']],
    ['5G', ['F', 'V', 'O'], ['F', 'H', 'V', 'O']],
    ['6G', ['F', 'H', 'V', 'O'], ['F', 'H', 'V', 'O']],
  ])('from memory: QW-461.9 — ASME pipe %s qualifies groove %j, fillet %j', (position, groove, fillet) => {
    expect(qualifiedRanges(pipe({ position, progression: 'uphill' })).positions).toEqual({ groove, fillet });
  });

  it.each([
    ['1G', ['F'], ['F', 'H']],
    ['2G', ['F', 'H'], ['F', 'H']],
    ['3G', ['F', 'H', 'V'], ['F', 'H', 'V']],
    ['4G', ['F', 'O'], ['F', 'H', 'O']],
    ['3G+4G', ['F', 'H', 'V', 'O'], ['F', 'H', 'V', 'O']],
  ])(
    'published: AWS D1.1 Table 4.10 (2015) fillet column — AWS plate %s qualifies groove %j, fillet %j',
    (position, groove, fillet) => {
      const r = qualifiedRanges(plate({ code: 'aws-d1.1', position, progression: 'uphill' }));
      expect(r.positions).toEqual({ groove, fillet });
    },
  );

  it('from memory: AWS D1.1 Table 4.10 (2015) — pipe 6GR qualifies all positions', () => {
    const r = qualifiedRanges(
      pipe({
        code: 'aws-d1.1',
        position: '6GR',
        outsideDiameter: inch(6.625),
        thickness: inch(0.562),
        progression: 'uphill',
      }),
    );
    expect(r.positions.groove).toEqual(['F', 'H', 'V', 'O']);
  });

  it('from memory: QW-461.9 — fillet tests qualify fillet welds only', () => {
    expect(qualifiedRanges(plate({ weld: 'fillet', position: '2F' })).positions).toEqual({
      groove: [],
      fillet: ['F', 'H'],
    });
    expect(
      qualifiedRanges(pipe({ weld: 'fillet', position: '5F', progression: 'uphill' })).positions.fillet,
    ).toEqual(['F', 'H', 'V', 'O']);
  });

  it('from memory: QW-461.9 — a plate groove test qualifies pipe of 2-7/8 in OD and over in F only (F, H for 2G)', () => {
    const texts = (position: string) =>
      qualifiedRanges(plate({ position, progression: 'uphill' }))
        .limits.filter((l) => l.variable === 'positions')
        .map((l) => l.text);
    expect(texts('3G').some((t) => /2-7\/8 in .* in F only/.test(t))).toBe(true);
    expect(texts('2G').some((t) => /in F and H only/.test(t))).toBe(true);
  });

  it('from memory: ISO 9606-1 welding positions — PG (3G down) qualifies vertical down only, and butt welds no fillets', () => {
    const r = qualifiedRanges(
      plate({ code: 'iso-9606-1', position: '3G', progression: 'downhill', thickness: mm(10) }),
    );
    expect(r.positions).toEqual({ groove: ['V'], fillet: [] });
    expect(r.progression).toEqual(['downhill']);
    const up = qualifiedRanges(
      plate({ code: 'iso-9606-1', position: '3G', progression: 'uphill', thickness: mm(10) }),
    );
    expect(up.positions.groove).toEqual(['F', 'V']);
  });

  it('refuses a position the code or form does not have, or a fillet position on a groove coupon', () => {
    expect(fieldOf(() => qualifiedRanges(pipe({ position: '6GR' })))).toEqual(['position']);
    expect(fieldOf(() => qualifiedRanges(plate({ position: '6G' })))).toEqual(['position']);
    expect(fieldOf(() => qualifiedRanges(plate({ position: '2F' })))).toEqual(['position']);
    expect(fieldOf(() => qualifiedRanges(plate({ position: '7G' })))).toEqual(['position']);
  });

  it('accepts positions written loosely', () => {
    expect(qualifiedRanges(plate({ position: ' 3g + 4g ', progression: 'uphill' })).positions.groove).toEqual(
      ['F', 'V', 'O'],
    );
  });
});

describe('ASME IX thickness and diameter (TRADE.md §4)', () => {
  it('from memory: QW-452.1(b) — deposited t qualifies up to 2t, no minimum', () => {
    const r = qualifiedRanges(plate({ thickness: inch(0.375) }));
    expect(r.thickness).toMatchObject({ min: null, max: inch(0.75) });
    expect(
      qualifiedRanges(plate({ thickness: inch(0.75), depositedThickness: inch(0.25) })).thickness.max,
    ).toEqual(inch(0.5));
  });

  it('from memory: QW-452.1(b) — t of 1/2 in exactly with three layers: no upper limit; just under: 2t; two layers: 2t', () => {
    expect(qualifiedRanges(plate({ thickness: inch(0.5), layers: 3 })).thickness.max).toBeNull();
    expect(qualifiedRanges(plate({ thickness: inch(0.499), layers: 3 })).thickness.max).toEqual(inch(0.998));
    const two = qualifiedRanges(plate({ thickness: inch(0.5), layers: 2 }));
    expect(two.thickness.max).toEqual(inch(1));
    expect(two.limits.find((l) => l.variable === 'thickness')?.text).toMatch(/only 2 were welded/);
    expect(qualifiedRanges(plate({ thickness: inch(0.5) })).thickness.max).toEqual(inch(1));
  });

  it('from memory: QW-452.1(b) — in mm the 13 mm value applies', () => {
    expect(qualifiedRanges(plate({ thickness: mm(13), layers: 3 })).thickness.max).toBeNull();
    expect(qualifiedRanges(plate({ thickness: mm(12.9), layers: 3 })).thickness.max).toEqual(mm(25.8));
  });

  it('from memory: QW-404.32 — GMAW short-circuit under 1/2 in: 1.1t; at 1/2 in with three layers: no limit', () => {
    const sc = (t: number, layers?: number) =>
      qualifiedRanges(
        plate({ process: 'GMAW', transferMode: 'short-circuit', fNumber: 6, thickness: inch(t), layers }),
      );
    expect(sc(0.375).thickness.max).toEqual(inch(0.4125));
    expect(sc(0.5, 3).thickness.max).toBeNull();
    expect(sc(0.375).limits.find((l) => l.variable === 'thickness')?.clause).toBe('QW-404.32');
  });

  it('from memory: QW-452.3, QW-303.1 — pipe OD boundaries 1 in and 2-7/8 in', () => {
    const d = (od: number) => qualifiedRanges(pipe({ outsideDiameter: inch(od) })).diameter.min;
    expect(d(0.84)).toEqual(inch(0.84));
    expect(d(0.999)).toEqual(inch(0.999));
    expect(d(1)).toEqual(inch(1));
    expect(d(2.875)).toEqual(inch(1));
    expect(d(2.876)).toEqual(inch(2.875));
    expect(d(6.625)).toEqual(inch(2.875));
  });

  it('from memory: QW-452.3, QW-303.1 — in mm: 25 mm and 73 mm; plate coupons qualify 2-7/8 in (73 mm) and over', () => {
    const d = (od: number) =>
      qualifiedRanges(pipe({ outsideDiameter: mm(od), thickness: mm(6) })).diameter.min;
    expect(d(24)).toEqual(mm(24));
    expect(d(25)).toEqual(mm(25));
    expect(d(73)).toEqual(mm(25));
    expect(d(73.1)).toEqual(mm(73));
    expect(qualifiedRanges(plate()).diameter.min).toEqual(inch(2.875));
    expect(qualifiedRanges(plate({ thickness: mm(10) })).diameter.min).toEqual(mm(73));
  });

  it('needs the OD of a pipe coupon', () => {
    expect(fieldOf(() => qualifiedRanges(pipe({ outsideDiameter: undefined })))).toEqual(['outsideDiameter']);
  });
});

describe('AWS D1.1 thickness and diameter', () => {
  const aws = (more: Partial<CouponInput> = {}) => qualifiedRanges(plate({ code: 'aws-d1.1', ...more }));

  it('from memory: AWS D1.1 welder qualification table — 3/8 in plate qualifies 1/8 in to 3/4 in; 1 in plate 1/8 in and over', () => {
    expect(aws({ thickness: inch(0.375) }).thickness).toMatchObject({ min: inch(0.125), max: inch(0.75) });
    expect(aws({ thickness: inch(1) }).thickness).toMatchObject({ min: inch(0.125), max: null });
    // over 3/8 in and under 1 in: 2T (issue 9 error 6)
    expect(aws({ thickness: inch(0.999) }).thickness.max).toEqual(inch(1.998));
    expect(aws({ thickness: mm(10) }).thickness).toMatchObject({ min: mm(3), max: mm(20) });
    expect(aws({ thickness: mm(25) }).thickness.max).toBeNull();
  });

  it('from memory: AWS D1.1 Table 4.10 (2015) — plate groove tests qualify pipe only at 24 in OD and over', () => {
    expect(aws().diameter.min).toEqual(inch(24));
  });

  it('refuses a groove test plate under 3/8 in', () => {
    expect(fieldOf(() => aws({ thickness: inch(0.25) }))).toEqual(['thickness']);
  });

  it('from memory: AWS D1.1 Table 4.11 (2015) — standard test pipes', () => {
    const small = qualifiedRanges(
      pipe({ code: 'aws-d1.1', outsideDiameter: inch(2.375), thickness: inch(0.218) }),
    );
    expect(small.thickness).toMatchObject({ min: inch(0.125), max: inch(0.75) });
    expect(small.diameter).toMatchObject({ min: inch(0.75), max: inch(4) });
    const large = qualifiedRanges(
      pipe({ code: 'aws-d1.1', outsideDiameter: mm(168.3), thickness: mm(14.27) }),
    );
    expect(large.thickness).toMatchObject({ min: mm(5), max: null });
    expect(large.diameter).toMatchObject({ min: mm(100), max: null });
    expect(
      fieldOf(() =>
        qualifiedRanges(pipe({ code: 'aws-d1.1', outsideDiameter: inch(4.5), thickness: inch(0.237) })),
      ),
    ).toEqual(['outsideDiameter']);
  });
});

describe('API 1104 groups', () => {
  const api = (od: { value: number; unit: 'in' | 'mm' }, wall: { value: number; unit: 'in' | 'mm' }) =>
    qualifiedRanges(pipe({ code: 'api-1104', outsideDiameter: od, thickness: wall }));

  it('from memory: API 1104 single qualification — OD groups under 2.375 in, 2.375 to 12.750 in, over 12.750 in', () => {
    expect(api(inch(2.374), inch(0.2)).diameter).toEqual({
      min: null,
      max: inch(2.375),
      minExclusive: false,
      maxExclusive: true,
    });
    expect(api(inch(2.375), inch(0.2)).diameter).toEqual({
      min: inch(2.375),
      max: inch(12.75),
      minExclusive: false,
      maxExclusive: false,
    });
    expect(api(inch(12.75), inch(0.2)).diameter.max).toEqual(inch(12.75));
    expect(api(inch(12.751), inch(0.2)).diameter).toEqual({
      min: inch(12.75),
      max: null,
      minExclusive: true,
      maxExclusive: false,
    });
  });

  it('from memory: API 1104 single qualification — wall groups under 0.188 in, 0.188 to 0.750 in, over 0.750 in', () => {
    expect(api(inch(6.625), inch(0.187)).thickness).toMatchObject({
      min: null,
      max: inch(0.188),
      maxExclusive: true,
    });
    expect(api(inch(6.625), inch(0.188)).thickness).toMatchObject({ min: inch(0.188), max: inch(0.75) });
    expect(api(inch(6.625), inch(0.75)).thickness).toMatchObject({ min: inch(0.188), max: inch(0.75) });
    expect(api(inch(6.625), inch(0.751)).thickness).toMatchObject({
      min: inch(0.75),
      max: null,
      minExclusive: true,
    });
    expect(api(mm(168.3), mm(7.11)).thickness).toMatchObject({ min: mm(4.8), max: mm(19.1) });
  });

  it('refuses a plate coupon', () => {
    expect(fieldOf(() => qualifiedRanges(plate({ code: 'api-1104' })))).toEqual(['form']);
  });
});

describe('ISO 9606-1 thickness and diameter', () => {
  const iso = (more: Partial<CouponInput>) => qualifiedRanges(pipe({ code: 'iso-9606-1', ...more }));

  it('from memory: ISO 9606-1 material thickness — t under 3 mm: t to 2t; 3 to under 12 mm: 3 mm to 2t; 12 mm and over: 5 mm and over', () => {
    expect(iso({ thickness: mm(2.9), outsideDiameter: mm(60.3) }).thickness).toMatchObject({
      min: mm(2.9),
      max: mm(5.8),
    });
    expect(iso({ thickness: mm(3), outsideDiameter: mm(60.3) }).thickness).toMatchObject({
      min: mm(3),
      max: mm(6),
    });
    expect(iso({ thickness: mm(11.9), outsideDiameter: mm(60.3) }).thickness).toMatchObject({
      min: mm(3),
      max: mm(23.8),
    });
    expect(iso({ thickness: mm(12), outsideDiameter: mm(60.3) }).thickness).toMatchObject({
      min: mm(5),
      max: null,
    });
  });

  it('from memory: ISO 9606-1 outside diameter — D up to 25 mm: D to 2D; over 25 mm: 0.5D and over, at least 25 mm', () => {
    expect(iso({ thickness: mm(3), outsideDiameter: mm(25) }).diameter).toMatchObject({
      min: mm(25),
      max: mm(50),
    });
    expect(iso({ thickness: mm(3), outsideDiameter: mm(40) }).diameter).toMatchObject({
      min: mm(25),
      max: null,
    });
    expect(iso({ thickness: mm(3), outsideDiameter: mm(168.3) }).diameter).toMatchObject({
      min: mm(84.15),
      max: null,
    });
  });
});

describe('other essential variables (TRADE.md §5)', () => {
  it('from memory: ASME QW-402.4 — without backing qualifies with and without; with backing qualifies with only', () => {
    expect(qualifiedRanges(plate({ backing: false })).backing).toEqual(['with', 'without']);
    expect(qualifiedRanges(plate({ backing: true })).backing).toEqual(['with']);
  });

  it('from memory: ASME QW-433 — F-No. 4 qualifies F-No. 1 to 4; F-No. 5 and 6 themselves', () => {
    expect(qualifiedRanges(plate({ fNumber: 4, backing: true })).fNumbers).toEqual([1, 2, 3, 4]);
    expect(qualifiedRanges(plate({ fNumber: 3 })).fNumbers).toEqual([1, 2, 3]);
    expect(qualifiedRanges(plate({ fNumber: 1 })).fNumbers).toEqual([1]);
    expect(qualifiedRanges(plate({ fNumber: 5 })).fNumbers).toEqual([5]);
    expect(qualifiedRanges(plate({ fNumber: 6, process: 'GTAW' })).fNumbers).toEqual([6]);
    const without = qualifiedRanges(plate({ fNumber: 4, backing: false }));
    expect(without.fNumberBacking).toEqual([
      { fNumber: 1, backing: ['with'] },
      { fNumber: 2, backing: ['with'] },
      { fNumber: 3, backing: ['with'] },
      { fNumber: 4, backing: ['with', 'without'] },
    ]);
  });

  it('an F-No. outside the tables, or another code, qualifies the F-No. tested only', () => {
    expect(qualifiedRanges(plate({ fNumber: 9 })).fNumbers).toEqual([9]);
    expect(
      qualifiedRanges(
        plate({
          code: 'api-1104',
          form: 'pipe',
          position: '1G',
          outsideDiameter: inch(6.625),
          thickness: inch(0.28),
          fNumber: 4,
        }),
      ).fNumbers,
    ).toEqual([4]);
    expect(qualifiedRanges(plate({ fNumber: undefined, process: 'GTAW' })).fNumbers).toEqual([]);
  });

  // ---- issue 9, definite error 5 ------------------------------------------------------------------
  it.each([
    [21, [21, 22, 23, 24, 25, 26]],
    [26, [21, 22, 23, 24, 25, 26]],
    [34, [34, 41, 42, 43, 44, 45, 46]],
    [45, [34, 41, 42, 43, 44, 45, 46]],
    [51, [51, 52, 53, 54, 55]],
    [61, [61]],
    [31, [31]],
    [37, [37]],
    [71, [71]],
    [72, [72]],
  ])('from memory: ASME IX QW-433 — F-No. %i qualifies %j', (f, group) => {
    const r = qualifiedRanges(plate({ process: 'GTAW', fNumber: f, backing: false }));
    expect(r.fNumbers).toEqual(group);
    expect(r.fNumberBacking.every((d) => d.backing.join() === 'with,without')).toBe(true);
    expect(r.limits.find((l) => l.variable === 'fNumber')).toMatchObject({
      clause: 'QW-433',
      source: 'from-memory',
    });
  });

  it.each([
    [4, [1, 2, 3, 4]],
    [3, [1, 2, 3]],
    [2, [1, 2]],
    [1, [1]],
  ])(
    'from memory: AWS D1.1-2015 Table 4.12 item (2), Table 4.13 — SMAW F%i qualifies %j, backing plays no part',
    (f, down) => {
      for (const backing of [true, false]) {
        const r = qualifiedRanges(plate({ code: 'aws-d1.1', fNumber: f, backing }));
        expect(r.fNumbers).toEqual(down);
        expect(r.fNumberBacking.every((d) => d.backing.join() === 'with,without')).toBe(true);
      }
    },
  );

  it('from memory: AWS D1.1-2015 Table 4.12 — processes other than SMAW have no F-No. variable', () => {
    const r = qualifiedRanges(plate({ code: 'aws-d1.1', process: 'FCAW', fNumber: 6 }));
    expect(r.fNumbersAny).toBe(true);
    expect(r.limits.find((l) => l.variable === 'fNumber')?.text).toMatch(/no F-No\. variable for FCAW/);
  });

  it('from memory: ASME IX QW-404.14 — autogenous GTAW qualifies welding without filler metal only', () => {
    const r = qualifiedRanges(plate({ process: 'GTAW', fNumber: undefined, withoutFiller: true }));
    expect(r.withoutFillerOnly).toBe(true);
    expect(r.fNumbers).toEqual([]);
    expect(r.limits.find((l) => l.variable === 'fNumber')).toMatchObject({ clause: 'QW-404.14' });
    expect(
      fieldOf(() => qualifiedRanges(plate({ process: 'GTAW', fNumber: 6, withoutFiller: true }))),
    ).toEqual(['fNumber']);
    expect(fieldOf(() => qualifiedRanges(plate({ process: 'SMAW', withoutFiller: true })))).toEqual([
      'withoutFiller',
    ]);
  });

  it('from memory: ASME IX QW-404.14 — the limit says "without filler metal only" in words, and a filler test does not qualify autogenous welding', () => {
    const auto = qualifiedRanges(plate({ process: 'GTAW', fNumber: undefined, withoutFiller: true }));
    expect(auto.limits.find((l) => l.variable === 'fNumber')?.text).toMatch(/without filler metal only/);
    const withFiller = qualifiedRanges(plate({ process: 'GTAW', fNumber: 6 }));
    expect(withFiller.withoutFillerOnly).toBe(false);
    expect(withFiller.fNumbers).toEqual([6]);
  });

  it.each(['asme-ix', 'aws-d1.1'] as const)(
    'from memory: QW-461.9 / AWS D1.1 Table 4.10 (2015) — %s 2FR (pipe rotated, horizontal fillet) qualifies fillet welds F and H only; it is no plate position',
    (code) => {
      const r = qualifiedRanges(pipe({ code, weld: 'fillet', position: '2FR' }));
      expect(r.positions).toEqual({ groove: [], fillet: ['F', 'H'] });
      expect(fieldOf(() => qualifiedRanges(plate({ code, weld: 'fillet', position: '2FR' })))).toEqual([
        'position',
      ]);
    },
  );

  it('from memory: ASME QW-405.3; API 1104 — uphill and downhill qualify separately; vertical tests must say which', () => {
    expect(qualifiedRanges(plate({ position: '3G', progression: 'downhill' })).progression).toEqual([
      'downhill',
    ]);
    expect(qualifiedRanges(plate({ position: '1G', progression: 'uphill' })).progression).toBeNull();
    expect(fieldOf(() => qualifiedRanges(plate({ position: '3G' })))).toEqual(['progression']);
    expect(fieldOf(() => qualifiedRanges(pipe({ code: 'api-1104', position: '5G' })))).toEqual([
      'progression',
    ]);
  });

  it('from memory: ASME QW-409.2 — short-circuit qualifies only short-circuit; spray, globular and pulse each other', () => {
    const g = (transferMode: CouponInput['transferMode']) =>
      qualifiedRanges(plate({ process: 'GMAW', fNumber: 6, transferMode })).transferModes;
    expect(g('short-circuit')).toEqual(['short-circuit']);
    expect(g('pulse')).toEqual(['spray', 'globular', 'pulse']);
    expect(g('spray')).toEqual(['spray', 'globular', 'pulse']);
    expect(fieldOf(() => g(undefined))).toEqual(['transferMode']);
    expect(qualifiedRanges(plate()).transferModes).toBeNull();
  });
});

describe('every limit carries its clause', () => {
  const coupons: CouponInput[] = [
    plate(),
    plate({ position: '3G+4G', progression: 'uphill', thickness: mm(20), layers: 4 }),
    pipe({ position: '6G', progression: 'uphill' }),
    plate({ weld: 'fillet', position: '4F' }),
    plate({ code: 'aws-d1.1', thickness: inch(1), process: 'FCAW' }),
    pipe({ code: 'api-1104', position: '5G', progression: 'downhill', process: 'SMAW' }),
    pipe({
      code: 'iso-9606-1',
      position: '6G',
      progression: 'uphill',
      process: 'GMAW',
      transferMode: 'spray',
      thickness: mm(8),
      outsideDiameter: mm(114.3),
    }),
  ];

  it.each(coupons.map((c, i) => [i, c] as const))(
    'coupon %i: variable, clause and text on every limit; the notice says who governs',
    (_i, c) => {
      const r = qualifiedRanges(c);
      const variables = new Set(r.limits.map((l) => l.variable));
      for (const v of ['positions', 'thickness', 'diameter', 'fNumber', 'backing', 'progression'])
        expect(variables).toContain(v);
      for (const l of r.limits) {
        expect(l.clause.length).toBeGreaterThan(2);
        expect(l.text.length).toBeGreaterThan(10);
      }
      expect(r.notice).toMatch(/code edition in force.*inspector govern/);
    },
  );
});

describe('input validation', () => {
  it('names every bad field', () => {
    const fields = fieldOf(() =>
      qualifiedRanges({
        ...plate(),
        code: 'asme-x',
        thickness: inch(-1),
        backing: 'yes',
      } as unknown as CouponInput),
    );
    expect(fields.sort()).toEqual(['backing', 'code', 'thickness.value']);
  });
});

// ---- issue 9, definite errors 3, 4 and 6 ----------------------------------------------------------------

describe('plate groove tests on pipe (issue 9 error 3)', () => {
  it.each([
    ['1G', ['F'], ['F']],
    ['2G', ['F', 'H'], ['F', 'H']],
    ['3G', ['F', 'V'], ['F']],
    ['4G', ['F', 'O'], ['F']],
    ['3G+4G', ['F', 'V', 'O'], ['F']],
    ['2G+3G+4G', ['F', 'H', 'V', 'O'], ['F', 'H']],
  ])(
    'from memory: QW-461.9 — ASME plate %s: plate and pipe over 24 in OD %j; pipe 2-7/8 to 24 in OD %j',
    (position, plateAndLarge, smallPipe) => {
      const r = qualifiedRanges(plate({ position, progression: 'uphill' }));
      expect(r.positions.groove).toEqual(plateAndLarge);
      expect(r.grooveOnPipeUpTo24).toEqual(smallPipe);
    },
  );

  it('pipe tests have no separate small-pipe row; AWS plate tests qualify pipe only at 24 in and over', () => {
    expect(qualifiedRanges(pipe({ position: '6G', progression: 'uphill' })).grooveOnPipeUpTo24).toBeNull();
    expect(
      qualifiedRanges(plate({ code: 'aws-d1.1', position: '2G+3G+4G', progression: 'uphill' })).positions
        .groove,
    ).toEqual(['F', 'H', 'V', 'O']);
  });
});

describe('fillet welds from a groove test (issue 9 error 4)', () => {
  it('from memory: QW-303.1 — a groove test qualifies fillet welds in all thicknesses and diameters', () => {
    const r = qualifiedRanges(
      pipe({ outsideDiameter: inch(0.84), thickness: inch(0.147), position: '6G', progression: 'uphill' }),
    );
    expect(r.thickness.max).toEqual(inch(0.294));
    expect(r.diameter.min).toEqual(inch(0.84));
    expect(r.fillet).toEqual({
      thickness: { min: null, max: null, minExclusive: false, maxExclusive: false },
      diameter: { min: null, max: null, minExclusive: false, maxExclusive: false },
    });
    expect(r.limits.find((l) => l.variable === 'fillet')?.clause).toBe('QW-303.1');
  });

  it('a fillet test keeps its own limits for fillets', () => {
    const r = qualifiedRanges(
      pipe({ weld: 'fillet', position: '5F', outsideDiameter: inch(0.84), progression: 'uphill' }),
    );
    expect(r.fillet.diameter).toEqual(r.diameter);
  });
});

describe('AWS D1.1 plates over 3/8 in and under 1 in (issue 9 error 6)', () => {
  const aws = (more: Partial<CouponInput> = {}) => qualifiedRanges(plate({ code: 'aws-d1.1', ...more }));

  it('from memory: AWS D1.1-2015 Table 4.11 — qualifies 1/8 in to 2T', () => {
    expect(aws({ thickness: inch(0.5) }).thickness).toMatchObject({ min: inch(0.125), max: inch(1) });
    expect(aws({ thickness: mm(16) }).thickness).toMatchObject({ min: mm(3), max: mm(32) });
    expect(aws({ thickness: inch(0.375) }).thickness.max).toEqual(inch(0.75));
  });

  it('from memory: AWS D1.1-2015 Table 4.12 — backing, progression and GMAW-S cite the welder variables table, not a Beadroll default', () => {
    const r = aws({
      process: 'GMAW',
      transferMode: 'short-circuit',
      fNumber: 6,
      position: '3G',
      progression: 'uphill',
    });
    for (const variable of ['backing', 'progression', 'transferMode']) {
      const limit = r.limits.find((l) => l.variable === variable);
      expect(limit?.clause).toMatch(/^AWS D1\.1 Table 4\.12 \(2015\)/);
      expect(limit?.source).toBe('from-memory');
    }
  });
});
