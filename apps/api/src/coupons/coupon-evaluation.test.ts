import { describe, expect, it } from 'vitest';
import { couponRecordInput, type CouponRecordInput } from '@beadroll/rules';
import { AppError } from '../lib/errors.js';
import { attachmentRefs, evaluateCoupon, procedureProblem, type CouponFields } from './coupon-evaluation.js';

const ids = {
  welderId: '00000000-0000-4000-8000-000000000001',
  shopId: '00000000-0000-4000-8000-000000000002',
  procedureId: '00000000-0000-4000-8000-000000000003',
};

function fields(over: Partial<CouponRecordInput> = {}): CouponFields {
  const { welderId: _w, ...rest } = couponRecordInput.parse({
    ...ids,
    testedOn: '2026-01-12',
    coupon: {
      code: 'aws-d1.1',
      process: 'FCAW',
      form: 'plate',
      weld: 'groove',
      position: '3g',
      thickness: { value: 0.375, unit: 'in' },
      backing: true,
      progression: 'uphill',
    },
    examiner: { name: 'E. Xample' },
    visual: 'accept',
    examination: { method: 'bend', criteria: 'aws-d1.1', specimens: [{ kind: 'face' }, { kind: 'root' }] },
    ...over,
  });
  return rest;
}

const bend = (
  discontinuities: {
    sizeText: string;
    size: { value: number; unit: 'in' | 'mm' };
    location?: 'surface' | 'corner';
  }[],
) => ({
  method: 'bend' as const,
  criteria: 'aws-d1.1' as const,
  specimens: [
    {
      label: 'F1',
      kind: 'face' as const,
      discontinuities: discontinuities.map((d) => ({ location: 'surface' as const, ...d })),
    },
    { label: 'R1', kind: 'root' as const },
  ],
});

const fieldsOfError = (fn: () => unknown): Record<string, string> => {
  try {
    fn();
  } catch (err) {
    if (err instanceof AppError) return err.fields ?? {};
    throw err;
  }
  throw new Error('expected a validation error');
};

describe('evaluateCoupon', () => {
  it('accepts clean specimens and stores the criteria and rules version', () => {
    const e = evaluateCoupon(fields());
    expect(e).toMatchObject({ result: 'accept', reasons: [], criteriaId: 'aws-d1.1' });
    expect(e.coupon.position).toBe('3G');
  });

  it('rejects over 1/8 in (AWS D1.1 4.9.3.3, from memory) and prefixes the reason with the specimen label', () => {
    const e = evaluateCoupon(
      fields({ examination: bend([{ sizeText: '5/32', size: { value: 5 / 32, unit: 'in' } }]) }),
    );
    expect(e.result).toBe('reject');
    expect(e.reasons[0]?.message).toMatch(/^F1 \(face\): /);
    expect(e.reasons[0]?.clause).toMatch(/D1\.1/);
  });

  it('turns the sum of small ones over 3/8 in into a reject (AWS D1.1 4.9.3.3 cumulative, from memory)', () => {
    const many = Array.from({ length: 4 }, () => ({
      sizeText: '1/8',
      size: { value: 0.125, unit: 'in' as const },
    }));
    expect(evaluateCoupon(fields({ examination: bend(many.slice(0, 3)) })).result).toBe('accept');
    expect(evaluateCoupon(fields({ examination: bend(many) })).result).toBe('reject');
  });

  it('puts a visual reject first, stops the examination there and rejects the coupon (from memory: AWS D1.1-2015 4.9.1 welder visual criteria)', () => {
    const e = evaluateCoupon(fields({ visual: 'reject' }));
    expect(e.result).toBe('reject');
    expect(e.reasons).toEqual([
      {
        clause: 'AWS D1.1 4.9.1 (2015) welder visual criteria',
        message: 'The examiner rejected the weld on visual examination.',
      },
    ]);
    expect(e.evaluation.parts.map((p) => p.kind)).toEqual(['visual']);
  });

  it('refuses a claimed verdict that differs, naming the first reason', () => {
    const f = fieldsOfError(() =>
      evaluateCoupon(
        fields({
          claimedResult: 'accept',
          examination: bend([{ sizeText: '4 mm', size: { value: 4, unit: 'mm' } }]),
        }),
      ),
    );
    expect(f.claimedResult).toMatch(/^The evaluation gives Reject, not Accept: F1 \(face\): .*\(AWS D1\.1/);
    const g = fieldsOfError(() => evaluateCoupon(fields({ claimedResult: 'reject' })));
    expect(g.claimedResult).toBe(
      'The evaluation gives Accept, not Reject: every part of the examination meets the criteria',
    );
  });

  it('reads each typed size again and refuses one the client parsed differently', () => {
    const f = fieldsOfError(() =>
      evaluateCoupon(
        fields({
          examination: bend([
            { sizeText: '1-1/4 in', size: { value: 1.25, unit: 'in' } },
            { sizeText: '3/16', size: { value: 3 / 16, unit: 'mm' } },
            { sizeText: '3,2 mm', size: { value: 3.2, unit: 'mm' } },
          ]),
        }),
      ),
    );
    expect(Object.keys(f).sort()).toEqual([
      'examination.bend.specimens.0.discontinuities.1.size',
      'examination.bend.specimens.0.discontinuities.2.sizeText',
    ]);
  });

  it('fills the OD from the pipe size (ASME B36.10M, published: NPS 6 is 6.625 in OD) and refuses an unknown size on pipe.nps', () => {
    const pipe = {
      code: 'asme-ix' as const,
      process: 'SMAW' as const,
      form: 'pipe' as const,
      weld: 'groove' as const,
      position: '6G',
      thickness: { value: 0.28, unit: 'in' as const },
      backing: false,
      fNumber: 4,
      progression: 'uphill' as const,
    };
    const e = evaluateCoupon(
      fields({
        coupon: pipe,
        pipe: { nps: '6', schedule: '40' },
        examination: {
          criteria: 'asme-ix',
          bend: { specimens: [{ kind: 'face' }, { kind: 'face' }, { kind: 'root' }, { kind: 'root' }] },
        },
      }),
    );
    expect(e.coupon.outsideDiameter).toEqual({ value: 6.625, unit: 'in' });
    const f = fieldsOfError(() =>
      evaluateCoupon(fields({ coupon: pipe, pipe: { nps: '7', schedule: '40' } })),
    );
    expect(Object.keys(f)).toEqual(['pipe.nps']);
    expect(
      Object.keys(fieldsOfError(() => evaluateCoupon(fields({ pipe: { nps: '2', schedule: '80' } })))),
    ).toEqual(['pipe']);
  });

  it('refuses a coupon the rules cannot give ranges for, with fields under coupon.', () => {
    const f = fieldsOfError(() => evaluateCoupon(fields({ coupon: { ...fields().coupon, position: '2F' } })));
    expect(Object.keys(f).length).toBeGreaterThan(0);
    for (const k of Object.keys(f)) expect(k.startsWith('coupon')).toBe(true);
  });

  it('takes the RT report\'s reject, with its reason and clause (from memory: AWS D1.1-2015 4.30.3)', () => {
    const e = evaluateCoupon(
      fields({ examination: { method: 'radiography', result: 'reject', reportNumber: 'RT-7' } }),
    );
    expect(e).toMatchObject({
      result: 'reject',
      criteriaId: null,
      reasons: [{ message: 'The examination report rejects the weld.' }],
    });
    expect(e.reasons[0]?.clause).toMatch(/AWS D1\.1 4\.30\.3/);
  });

  it('refuses a 6G pipe coupon on one face and one root bend, naming examination.bend (from memory: ASME IX QW-452.1(a), four bends for 5G and 6G)', () => {
    const f = fieldsOfError(() =>
      evaluateCoupon(
        fields({
          coupon: {
            code: 'asme-ix',
            process: 'SMAW',
            form: 'pipe',
            weld: 'groove',
            position: '6G',
            thickness: { value: 0.28, unit: 'in' },
            outsideDiameter: { value: 6.625, unit: 'in' },
            backing: false,
            progression: 'uphill',
          },
          examination: { bend: { specimens: [{ kind: 'face' }, { kind: 'root' }] } },
        }),
      ),
    );
    expect(Object.keys(f)).toEqual(['examination.bend']);
    expect(f['examination.bend']).toMatch(/QW-452\.1/);
  });
});

describe('procedureProblem and attachmentRefs', () => {
  const p = { number: '123', revision: 'B', code: 'asme-ix', processes: ['SMAW', 'GTAW'], status: 'active' };
  it('names what is wrong with the WPS', () => {
    expect(procedureProblem(p, { code: 'asme-ix', process: 'SMAW' })).toBeNull();
    expect(procedureProblem({ ...p, status: 'superseded' }, { code: 'asme-ix', process: 'SMAW' })).toBe(
      'WPS 123 rev B is superseded',
    );
    expect(procedureProblem(p, { code: 'aws-d1.1', process: 'SMAW' })).toBe(
      'WPS 123 rev B is for ASME IX, not AWS D1.1',
    );
    expect(procedureProblem(p, { code: 'asme-ix', process: 'FCAW' })).toBe(
      'WPS 123 rev B does not cover FCAW',
    );
  });
  it('lists the photo and report ids with their fields', () => {
    const id = '00000000-0000-4000-8000-00000000000a';
    expect(
      attachmentRefs(
        fields({
          examination: {
            method: 'bend',
            criteria: 'asme-ix',
            specimens: [{ kind: 'face' }, { kind: 'root', photoUploadId: id }],
          },
        }),
      ),
    ).toEqual([{ field: 'examination.bend.specimens.1.photoUploadId', id }]);
    expect(
      attachmentRefs(fields({ examination: { method: 'ultrasonic', result: 'accept', reportUploadId: id } })),
    ).toEqual([{ field: 'examination.volumetric.reportUploadId', id }]);
  });
});
