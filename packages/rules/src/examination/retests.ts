// Retests as the codes allow them, linked to the failed test (TRADE.md §8, all from memory).
import { type CodeId } from '../schemas/common.js';
import { type CouponResult, type Retest } from '../schemas/examination.js';
import { type Reason } from './judges.js';

type RetestRule = { clause: string; source: string; immediateCoupons: number; immediateLimit: number | null };

export const RETEST_RULES: Record<CodeId, RetestRule> = {
  // QW-321.1/.2: an immediate retest is two consecutive coupons for each position failed, all passing;
  // QW-321.3: after further training, one complete retest
  'asme-ix': {
    clause: 'QW-321',
    source: 'from memory: ASME IX QW-321.1 to QW-321.3',
    immediateCoupons: 2,
    immediateLimit: null,
  },
  'aws-d1.1': {
    clause: 'AWS D1.1 4.24 (2015) retest',
    source:
      'from memory: AWS D1.1-2015 4.24.1 (immediate retest: two welds of each type failed, all passing), 4.24.2 (after further training: one retest)',
    immediateCoupons: 2,
    immediateLimit: null,
  },
  // a second opportunity when the failure came from conditions beyond the welder's control; no further
  // retest without proof of further training
  'api-1104': {
    clause: 'API 1104 welder retesting',
    source:
      'from memory: API 1104 retesting (one second opportunity; further retests only after documented training)',
    immediateCoupons: 1,
    immediateLimit: 1,
  },
  'iso-9606-1': {
    clause: 'ISO 9606-1 (retest: a complete new test)',
    source:
      'common practice (no source): ISO 9606-1 has no retest clause in Beadroll rules; a retest is a complete new test',
    immediateCoupons: 1,
    immediateLimit: null,
  },
};

export function retestVerdict(
  code: CodeId,
  r: NonNullable<Retest>,
): { result: CouponResult; reasons: Reason[]; notes: Reason[] } {
  const rule = RETEST_RULES[code];
  const notes: Reason[] = [
    {
      clause: rule.clause,
      message: `Retest of ${r.of}${r.failedOn ? ` (failed on ${r.failedOn})` : ''}, ${r.basis === 'immediate' ? 'immediate' : 'after further training'}.`,
    },
  ];
  const prior = r.priorRetests ?? 0;
  if (r.basis === 'after-training') return { result: 'accept', reasons: [], notes };
  if (rule.immediateLimit !== null && prior >= rule.immediateLimit)
    return {
      result: 'incomplete',
      reasons: [
        {
          clause: rule.clause,
          message: `${prior} retest${prior === 1 ? '' : 's'} already made: a further retest needs proof of further training (record it as a retest after training).`,
        },
      ],
      notes,
    };
  const companions = r.companions ?? [];
  if (companions.some((x) => x === 'reject'))
    return {
      result: 'reject',
      reasons: [
        { clause: rule.clause, message: 'Another coupon of this immediate retest failed: the retest fails.' },
      ],
      notes,
    };
  const need = rule.immediateCoupons - 1;
  if (companions.length < need || companions.some((x) => x !== 'accept'))
    return {
      result: 'incomplete',
      reasons: [
        {
          clause: rule.clause,
          message: `An immediate retest is ${rule.immediateCoupons} coupons, every one passing: record the other coupon's passing verdict.`,
        },
      ],
      notes,
    };
  return { result: 'accept', reasons: [], notes };
}
