// GET /api/auth/session: who is signed in, or nobody — 200 either way, so opening the sign-in page logs
// no 401 in the browser (issue 10, item 15). It answers from the same session check as every route.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { z } from 'zod';
import { meSchema } from '@beadroll/rules';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const sessionSchema = z.object({ me: meSchema.nullable() });

describe('GET /api/auth/session', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('answers nobody with 200 to a visitor without a session or with a forged cookie', async () => {
    expect(bodyOf(sessionSchema, await request(api.app).get('/api/auth/session').expect(200))).toEqual({ me: null });
    const forged = await request(api.app)
      .get('/api/auth/session')
      .set('Cookie', 'beadroll_session=eyJhbGciOiJIUzI1NiJ9.e30.not-a-signature')
      .expect(200);
    expect(bodyOf(sessionSchema, forged)).toEqual({ me: null });
  });

  it('answers the signed-in person, and nobody at once after signing out', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const me = bodyOf(sessionSchema, await qa.get('/api/auth/session').expect(200)).me;
    expect(me).toMatchObject({ email: world.qa.email, role: 'qa_manager' });
    expect(me).toEqual(bodyOf(meSchema, await qa.get('/api/me').expect(200)));
    await qa.post('/api/auth/logout').expect(204);
    expect(bodyOf(sessionSchema, await qa.get('/api/auth/session').expect(200))).toEqual({ me: null });
  });
});
