// Property test (issue 12): the crew finder returns exactly the welders for whom qualified-on answers yes
// both today and on the range's last day. fast-check builds small companies — welders with qualifications
// of several kinds of coupon, tested at random in the last two years, logged use, revocations past and
// future — and a joint and a range; the finder (distinct ranges judged once, the maintained continuity
// state, SQL classification) must agree with qualified-on (jointWithin per qualification, the continuity
// walk cut at the day) for every welder.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, type CouponInput, type QualifiedOnInput } from '@beadroll/rules';
import { startTestApi, type TestApi } from '../../support/api-app.js';
import { makeCompany, makeShop, makeUser, makeWelder } from '../../support/factories.js';
import type { Actor } from '../../../apps/api/src/lib/scope.js';
import { findCrew } from '../../../apps/api/src/crew-finder/crew-finder.service.js';
import { qualifiedOnInCompany } from '../../../apps/api/src/qualified-on/qualified-on.service.js';
import { companyToday } from '../../../apps/api/src/settings/settings.repository.js';
import { logUse, makeProcedureFor, makeQualification, pipe6G } from './qualified-on-factories.js';

const RUNS = Number(process.env.FUZZ_RUNS ?? 12);
const TIME_LIMIT_MS = Number(process.env.FUZZ_TIME_LIMIT_MS ?? 40_000);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;

const plate = (position: string, more: Partial<CouponInput> = {}): CouponInput =>
  ({ ...pipe6G, form: 'plate', position, outsideDiameter: undefined, thickness: { value: 0.5, unit: 'in' }, ...more });
const COUPONS: CouponInput[] = [
  pipe6G,
  plate('1G'),
  plate('3G', { backing: true }),
  { ...pipe6G, progression: 'downhill' },
  { ...pipe6G, thickness: { value: 0.154, unit: 'in' }, outsideDiameter: { value: 2.375, unit: 'in' } },
];
const JOINTS: Pick<QualifiedOnInput, 'joint' | 'positions'>[] = [
  {
    joint: { form: 'pipe', weld: 'groove', position: 'F', thickness: { value: 0.432, unit: 'in' }, outsideDiameter: { value: 6.625, unit: 'in' }, backing: false, fNumber: 4, progression: 'uphill' },
    positions: ['F', 'H', 'V', 'O'],
  },
  { joint: { form: 'plate', weld: 'groove', position: 'F', thickness: { value: 0.375, unit: 'in' }, backing: true, fNumber: 4 } },
  { joint: { form: 'plate', weld: 'groove', position: 'V', thickness: { value: 0.75, unit: 'in' }, backing: true, fNumber: 3, progression: 'uphill' } },
  { joint: { form: 'plate', weld: 'fillet', position: 'H', thickness: { value: 0.25, unit: 'in' }, backing: false, fNumber: 4 } },
];

const arbQual = fc.record({
  coupon: fc.nat(COUPONS.length - 1),
  testedDaysAgo: fc.integer({ min: 0, max: 730 }),
  uses: fc.array(fc.integer({ min: 0, max: 730 }), { maxLength: 4 }),
  // Days from the test to a revocation: past or (up to about a year) future.
  revoke: fc.option(fc.integer({ min: 0, max: 1100 }), { freq: 4 }),
});
const arbCompany = fc.record({
  welders: fc.array(fc.array(arbQual, { maxLength: 3 }), { minLength: 1, maxLength: 5 }),
  joint: fc.nat(JOINTS.length - 1),
  throughDays: fc.integer({ min: 0, max: 120 }),
});

describe('crew finder = qualified-on, for all companies (property)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('returns exactly the welders qualified on the joint today and on the last day of the range', async () => {
    const started = Date.now();
    await fc.assert(
      fc.asyncProperty(arbCompany, async (c) => {
        if (Date.now() - started > TIME_LIMIT_MS) return;
        const org = await makeCompany(api.ds);
        const shop = await makeShop(api.ds, org, 'PP', 'Property Bay');
        const qa = await makeUser(api.ds, org, { role: 'qa_manager', name: 'Prop QA' });
        const wps = await makeProcedureFor(api.ds, org);
        const actor: Actor = { id: qa.id, organizationId: org.id, role: 'qa_manager', welderId: null, shopIds: [] };
        const today = await companyToday(api.ds.manager, actor, api.deps.clock);
        const welders = [];
        for (const [i, quals] of c.welders.entries()) {
          const welder = await makeWelder(api.ds, org, shop, { stamp: `P-${i}`, name: `Prop Welder ${i}` });
          welders.push(welder);
          for (const q of quals) {
            const testedOn = addDays(today, -q.testedDaysAgo);
            const revokedOn = q.revoke === null ? undefined : addDays(testedOn, q.revoke);
            await makeQualification(api.ds, {
              org, shop, welder, procedureId: wps, qa, testedOn, coupon: COUPONS[q.coupon],
              ...(revokedOn ? { revokedOn } : {}),
            });
            for (const u of q.uses)
              if (u < q.testedDaysAgo)
                // One cell per welder, process, shop and month: a second use in a month is not logged.
                await logUse(api.ds, { org, shop, welder, usedOn: addDays(today, -u), by: qa, job: `J-${i}` }).catch(() => undefined);
          }
        }
        const through = addDays(today, c.throughDays);
        const joint = JOINTS[c.joint]!;
        const ask = { process: 'SMAW' as const, through, joint: joint.joint, positions: joint.positions ?? [joint.joint.position] };
        // Paged through two at a time: the pages together are the whole crew, each welder once, longest in force first.
        const pages = [];
        for (let offset = 0; ; offset += 2) {
          const page = await findCrew(api.deps, actor, { ...ask, limit: 2, offset, nearLimit: 2, nearOffset: offset });
          pages.push(page);
          if (offset + 2 >= Math.max(page.crew.total, page.nearMisses.total)) break;
        }
        const found = { crew: { total: pages[0]!.crew.total, items: pages.flatMap((p) => p.crew.items) }, nearMisses: { total: pages[0]!.nearMisses.total, items: pages.flatMap((p) => p.nearMisses.items) } };
        const lapses = found.crew.items.map((m) => m.lapsesOn);
        expect(lapses).toEqual([...lapses].sort().reverse());
        expect(found.nearMisses.items).toHaveLength(found.nearMisses.total);
        expect(new Set(found.nearMisses.items.map((n) => n.welder.stamp)).size).toBe(found.nearMisses.total);
        const expected: string[] = [];
        for (const w of welders) {
          const ask = (date: string) => qualifiedOnInCompany(api.ds.manager, org.id, w.id, { date, process: 'SMAW', ...joint });
          if ((await ask(today)).qualified && (await ask(through)).qualified) expected.push(w.stamp);
        }
        expect(found.crew.items.map((m) => m.welder.stamp).sort()).toEqual(expected.sort());
        expect(found.crew.total).toBe(expected.length);
        // A near miss is never on the crew.
        for (const n of found.nearMisses.items) expect(expected).not.toContain(n.welder.stamp);
      }),
      { numRuns: RUNS, ...(SEED === undefined ? {} : { seed: SEED }) },
    );
  }, 180_000);
});
