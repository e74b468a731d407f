import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { AppError, fieldsFromZod, isDatabaseUnavailable, toAppError } from './errors.js';

describe('toAppError', () => {
  it('turns a zod error into 400 with dotted field paths, first message per field', () => {
    const schema = z.object({
      name: z.string().min(1, 'Required'),
      shopIds: z.array(z.string().uuid('Not a valid id')),
    });
    const result = schema.safeParse({ name: '', shopIds: ['x', 'y'] });
    expect(result.success).toBe(false);
    const err = toAppError(result.error);
    expect(err).toMatchObject({
      code: 'validation',
      status: 400,
      fields: { name: 'Required', 'shopIds.0': 'Not a valid id', 'shopIds.1': 'Not a valid id' },
    });
  });

  it('names a body that is not an object as _body', () => {
    const result = z.object({ a: z.string() }).safeParse(undefined);
    expect(fieldsFromZod(result.error!)).toEqual({ _body: expect.any(String) as string });
  });

  it('maps body-parser failures to 400 and 413', () => {
    expect(toAppError(Object.assign(new Error('x'), { type: 'entity.parse.failed' }))?.status).toBe(400);
    expect(toAppError(Object.assign(new Error('x'), { type: 'entity.too.large' }))?.code).toBe(
      'payload_too_large',
    );
  });

  it('maps an unreachable database to 503 and leaves other errors unknown', () => {
    expect(
      toAppError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' }))
        ?.status,
    ).toBe(503);
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true);
    expect(toAppError(new Error('boom'))).toBeNull();
  });

  it('keeps an AppError as it is', () => {
    const e = AppError.conflict('stale');
    expect(toAppError(e)).toBe(e);
    expect(e.status).toBe(409);
  });
});
