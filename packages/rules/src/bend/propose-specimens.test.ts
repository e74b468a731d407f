import { describe, expect, it } from 'vitest';
import { RulesInputError } from '../validation/rules-input-error.js';
import { proposeBendSpecimens } from './propose-specimens.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const mm = (value: number) => ({ value, unit: 'mm' as const });
const first = (
  code: 'asme-ix' | 'aws-d1.1',
  form: 'plate' | 'pipe',
  position: string,
  t: { value: number; unit: 'in' | 'mm' },
) => proposeBendSpecimens({ code, form, position, depositedThickness: t });

describe('proposeBendSpecimens', () => {
  it('published: ASME IX QW-452.1(a) (read second-hand) — under 3/8 in: one face and one root bend', () => {
    const p = first('asme-ix', 'plate', '1G', inch(0.374));
    expect(p.options).toEqual([
      [
        { kind: 'face', count: 1 },
        { kind: 'root', count: 1 },
      ],
    ]);
    expect(p.clause).toBe('QW-452.1(a)');
  });

  it('published: ASME IX QW-452.1(a) (read second-hand) — 3/8 in exactly up to under 3/4 in: two side bends, or face and root', () => {
    expect(first('asme-ix', 'plate', '3G', inch(0.375)).options).toEqual([
      [{ kind: 'side', count: 2 }],
      [
        { kind: 'face', count: 1 },
        { kind: 'root', count: 1 },
      ],
    ]);
    expect(first('asme-ix', 'plate', '3G', inch(0.749)).options[0]).toEqual([{ kind: 'side', count: 2 }]);
  });

  it('published: ASME IX QW-452.1(a) (read second-hand) — 3/4 in and over: two side bends only', () => {
    expect(first('asme-ix', 'plate', '2G', inch(0.75)).options).toEqual([[{ kind: 'side', count: 2 }]]);
  });

  it('from memory: QW-452.1(a) SI values 10 mm and 19 mm — a coupon recorded in mm is judged in mm', () => {
    expect(first('asme-ix', 'plate', '1G', mm(9.9)).options).toHaveLength(1);
    expect(first('asme-ix', 'plate', '1G', mm(10)).options[0]).toEqual([{ kind: 'side', count: 2 }]);
    expect(first('asme-ix', 'plate', '1G', mm(19)).options).toEqual([[{ kind: 'side', count: 2 }]]);
  });

  it('published: ASME IX QW-452.1(a) (read second-hand) — 5G and 6G pipe take four bends; 2G + 5G six', () => {
    expect(first('asme-ix', 'pipe', '6G', inch(0.28)).options).toEqual([
      [
        { kind: 'face', count: 2 },
        { kind: 'root', count: 2 },
      ],
    ]);
    expect(first('asme-ix', 'pipe', '5G', inch(0.8)).options).toEqual([[{ kind: 'side', count: 4 }]]);
    expect(first('asme-ix', 'pipe', '2G+5G', inch(0.2)).options).toEqual([
      [
        { kind: 'face', count: 3 },
        { kind: 'root', count: 3 },
      ],
    ]);
    expect(first('asme-ix', 'pipe', '2G', inch(0.2)).options).toEqual([
      [
        { kind: 'face', count: 1 },
        { kind: 'root', count: 1 },
      ],
    ]);
  });

  it('from memory: AWS D1.1 Table 4.11 (2015) — 3/8 in plate face and root (or two side); 1 in plate two side', () => {
    expect(first('aws-d1.1', 'plate', '3G', inch(0.375)).options).toEqual([
      [
        { kind: 'face', count: 1 },
        { kind: 'root', count: 1 },
      ],
      [{ kind: 'side', count: 2 }],
    ]);
    expect(first('aws-d1.1', 'plate', '3G', inch(1)).options).toEqual([[{ kind: 'side', count: 2 }]]);
  });

  it('from memory: AWS D1.1 Table 4.11 (2015) — pipe 1G/2G two bends, 5G/6G/6GR four', () => {
    expect(first('aws-d1.1', 'pipe', '2G', inch(0.218)).options[0]).toEqual([
      { kind: 'face', count: 1 },
      { kind: 'root', count: 1 },
    ]);
    expect(first('aws-d1.1', 'pipe', '6GR', inch(0.562)).options).toEqual([
      [
        { kind: 'face', count: 2 },
        { kind: 'root', count: 2 },
      ],
      [{ kind: 'side', count: 4 }],
    ]);
  });

  it('3G + 4G is two coupons, each with its own full set: four bends in all (issue 9 error 2; published: ASME IX QW-452.1(a), read second-hand)', () => {
    expect(first('asme-ix', 'plate', '3G+4G', inch(0.25)).options).toEqual([
      [
        { kind: 'face', count: 2 },
        { kind: 'root', count: 2 },
      ],
    ]);
    expect(first('asme-ix', 'plate', '3G+4G', inch(0.5)).options).toEqual([
      [{ kind: 'side', count: 4 }],
      [
        { kind: 'face', count: 2 },
        { kind: 'root', count: 2 },
      ],
    ]);
    expect(first('aws-d1.1', 'plate', '3G+4G', inch(1)).options).toEqual([[{ kind: 'side', count: 4 }]]);
    expect(first('asme-ix', 'plate', '3G+4G', inch(0.25)).text).toMatch(
      /4 specimens in all for 3G\+4G \(2 coupons/,
    );
  });

  it('from memory: AWS D1.1-2015 Table 4.11 — a plate over 3/8 in and under 1 in takes two side bends (issue 9 error 6)', () => {
    expect(first('aws-d1.1', 'plate', '2G', inch(0.5)).options).toEqual([[{ kind: 'side', count: 2 }]]);
    expect(first('aws-d1.1', 'plate', '2G', inch(0.75)).options).toEqual([[{ kind: 'side', count: 2 }]]);
    expect(first('aws-d1.1', 'plate', '2G', mm(12)).options).toEqual([[{ kind: 'side', count: 2 }]]);
    expect(first('aws-d1.1', 'plate', '2G', mm(10)).options[0]).toEqual([
      { kind: 'face', count: 1 },
      { kind: 'root', count: 1 },
    ]);
  });

  it.each([
    [2.375, 0.218, [{ kind: 'root', count: 2 }], 2],
    [6.625, 0.28, [{ kind: 'root', count: 2 }], 2],
    [6.625, 0.562, [{ kind: 'side', count: 2 }], 2],
    [
      16,
      0.375,
      [
        { kind: 'face', count: 2 },
        { kind: 'root', count: 2 },
      ],
      4,
    ],
    [24, 0.688, [{ kind: 'side', count: 4 }], 4],
  ])(
    'from memory: API 1104 welder qualification specimen table — OD %d in, wall %d in: bends %j and %d nick-breaks',
    (od, wall, set, nick) => {
      const p = proposeBendSpecimens({
        code: 'api-1104',
        form: 'pipe',
        position: '6G',
        depositedThickness: inch(wall),
        outsideDiameter: inch(od),
      });
      expect(p.known).toBe(true);
      expect(p.options).toEqual([set]);
      expect(p.text).toMatch(new RegExp(`${nick} nick-break`));
    },
  );

  it('says so where Beadroll has no specimen table (api-1104, iso-9606-1)', () => {
    const p = proposeBendSpecimens({
      code: 'iso-9606-1',
      form: 'pipe',
      position: '6G',
      depositedThickness: mm(8),
    });
    expect(p.known).toBe(false);
    expect(p.options).toEqual([]);
    expect(p.text).toMatch(/take the number and kind of specimens from the code/);
  });

  it('refuses a fillet test position and a bad thickness, naming the field', () => {
    expect(() => first('asme-ix', 'plate', '2F', inch(0.5))).toThrow(RulesInputError);
    try {
      first('asme-ix', 'plate', '1G', inch(0));
    } catch (e) {
      expect((e as RulesInputError).fields).toHaveProperty(['depositedThickness.value']);
    }
  });
});
