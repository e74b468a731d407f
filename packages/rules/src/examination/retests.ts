// Retests as the codes allow them, linked to the failed test (TRADE.md §8, all from memory). A retest is
// judged twice: each coupon by its own examination (evaluateCoupon), and the retest as a whole — an
// immediate retest of two coupons passes only when both do — by retestSetVerdict, which the server runs
// over every coupon recorded as the same retest and which certification waits for.
import { type CodeId } from '../schemas/common.js';
import { type CouponResult, type Retest, type RetestBasis } from '../schemas/examination.js';
import { type Reason } from './judges.js';

export type RetestOption = {
  basis: RetestBasis;
  /** Coupons the retest is made of; every one must pass. */
  coupons: number;
  clause: string;
  source: string;
  /** What the code asks of this kind of retest, in plain words for the form. */
  text: string;
};

type RetestRule = {
  clause: string;
  source: string;
  immediate: RetestOption & {
    /** Immediate retests allowed after one failed test (null: the code sets no number). */
    limit: number | null;
  };
  afterTraining: RetestOption;
  /** Where the code says an immediate retest after a failed radiograph is examined the same way. */
  volumetric?: { clause: string; message: string };
};

export const RETEST_RULES: Record<CodeId, RetestRule> = {
  'asme-ix': {
    clause: 'QW-321',
    source: 'from memory: ASME IX QW-321.1 to QW-321.4',
    immediate: {
      basis: 'immediate',
      coupons: 2,
      limit: null,
      // QW-321.1 (failed visual), QW-321.2 (failed mechanical tests): two consecutive coupons for each
      // position failed, all passing
      clause: 'QW-321.2',
      source: 'from memory: ASME IX QW-321.1, QW-321.2',
      text: 'Two consecutive test coupons in the position failed, every one passing the whole examination.',
    },
    afterTraining: {
      basis: 'after-training',
      coupons: 1,
      clause: 'QW-321.4',
      source: 'from memory: ASME IX QW-321.4 (further training)',
      text: 'After further training or practice: a new test in the position failed.',
    },
    volumetric: {
      clause: 'QW-321.3',
      message:
        'The failed coupon failed its radiography or ultrasonics: an immediate retest is examined the same way (volumetric examination).',
    },
  },
  'aws-d1.1': {
    clause: 'AWS D1.1 4.24.1 (2015)',
    source: 'from memory: AWS D1.1-2015 4.24.1.1, 4.24.1.2 (6.24 area in 2020)',
    immediate: {
      basis: 'immediate',
      coupons: 2,
      limit: null,
      clause: 'AWS D1.1 4.24.1.1 (2015)',
      source: 'from memory: AWS D1.1-2015 4.24.1.1 (immediate retest)',
      text: 'Two test welds of each type failed, every retest specimen meeting all the requirements.',
    },
    afterTraining: {
      basis: 'after-training',
      coupons: 1,
      clause: 'AWS D1.1 4.24.1.2 (2015)',
      source: 'from memory: AWS D1.1-2015 4.24.1.2 (retest after further training or practice)',
      text: 'With evidence of further training or practice: a complete retest of the types failed.',
    },
  },
  'api-1104': {
    clause: 'API 1104 6.7 (welder retesting)',
    source: 'from memory: API 1104 (20th/21st editions) 6.7 retesting',
    immediate: {
      basis: 'immediate',
      coupons: 1,
      limit: 1,
      clause: 'API 1104 6.7 (welder retesting)',
      source:
        'from memory: API 1104 6.7 (a second opportunity when company and contractor agree the failure came from conditions beyond the welder’s control)',
      text: 'One second opportunity, when the company and the contractor agree the failure came from conditions beyond the welder’s control.',
    },
    afterTraining: {
      basis: 'after-training',
      coupons: 1,
      clause: 'API 1104 6.7 (welder retesting)',
      source: 'from memory: API 1104 6.7 (no further retest until proof of subsequent training acceptable to the company)',
      text: 'After proof of further training acceptable to the company: a new test.',
    },
  },
  'iso-9606-1': {
    clause: 'ISO 9606-1 (retest: a complete new test)',
    source:
      'common practice (no source): ISO 9606-1 has no retest clause in Beadroll rules; a retest is a complete new test',
    immediate: {
      basis: 'immediate',
      coupons: 1,
      limit: null,
      clause: 'ISO 9606-1 (retest: a complete new test)',
      source: 'common practice (no source): a retest is a complete new test',
      text: 'A complete new test coupon.',
    },
    afterTraining: {
      basis: 'after-training',
      coupons: 1,
      clause: 'ISO 9606-1 (retest: a complete new test)',
      source: 'common practice (no source): a retest is a complete new test',
      text: 'After further training: a complete new test coupon.',
    },
  },
};

/** The kinds of retest a code allows, for the form to offer (immediate first). */
export function retestOptions(code: CodeId): RetestOption[] {
  const rule = RETEST_RULES[code];
  const { limit: _limit, ...immediate } = rule.immediate;
  return [immediate, rule.afterTraining];
}

export type RetestSetResult = 'accept' | 'reject' | 'awaiting';

/** The retest as a whole: its coupons' own verdicts together. */
export type RetestSetVerdict = {
  result: RetestSetResult;
  basis: RetestBasis;
  /** Coupons the retest is made of, and how many of them are recorded. */
  needed: number;
  recorded: number;
  clause: string;
  message: string;
};

/**
 * Judges a retest as a whole from the verdicts of every coupon recorded as that retest (this one
 * included): all `needed` of them passing → accept; any failing → reject; else awaiting the rest.
 */
export function retestSetVerdict(code: CodeId, basis: RetestBasis, results: CouponResult[]): RetestSetVerdict {
  const option = basis === 'immediate' ? RETEST_RULES[code].immediate : RETEST_RULES[code].afterTraining;
  const needed = option.coupons;
  const recorded = results.length;
  const base = { basis, needed, recorded, clause: option.clause };
  if (results.some((r) => r === 'reject'))
    return {
      ...base,
      result: 'reject',
      message:
        needed > 1
          ? `A coupon of this ${needed}-coupon retest failed: the retest fails, and a further retest needs further training (${RETEST_RULES[code].afterTraining.clause}).`
          : 'The retest coupon failed.',
    };
  if (recorded < needed || results.some((r) => r !== 'accept'))
    return {
      ...base,
      result: 'awaiting',
      message: `This retest is ${needed} coupons, every one passing: ${recorded} of ${needed} recorded${
        results.some((r) => r !== 'accept') ? ', not all passing yet' : ''
      }. It can be certified once all ${needed} pass.`,
    };
  return {
    ...base,
    result: 'accept',
    message: needed > 1 ? `All ${needed} coupons of the retest passed.` : 'The retest coupon passed.',
  };
}

/**
 * The retest part of one coupon's examination: the link to the failed test and what the code allows.
 * It fails the coupon only where the code does not allow the retest (a further immediate retest where
 * the code allows one, an immediate retest after a failed radiograph not examined the same way); the
 * retest as a whole is `set` (retestSetVerdict over this coupon and its companions).
 */
export function retestVerdict(
  code: CodeId,
  r: NonNullable<Retest>,
  own: { result: CouponResult; volumetric: boolean },
): { result: CouponResult; reasons: Reason[]; notes: Reason[]; set: RetestSetVerdict } {
  const rule = RETEST_RULES[code];
  const option = r.basis === 'immediate' ? rule.immediate : rule.afterTraining;
  const notes: Reason[] = [
    {
      clause: option.clause,
      message: `Retest of ${r.of}${r.failedOn ? ` (failed on ${r.failedOn})` : ''}, ${r.basis === 'immediate' ? 'immediate' : 'after further training'}: ${option.text}`,
    },
  ];
  const set = retestSetVerdict(code, r.basis, [...(r.companions ?? []), own.result]);
  if (set.result !== 'accept' || set.needed > 1) notes.push({ clause: set.clause, message: set.message });
  const prior = r.priorRetests ?? 0;
  const reasons: Reason[] = [];
  if (r.basis === 'immediate' && rule.immediate.limit !== null && prior >= rule.immediate.limit)
    reasons.push({
      clause: rule.immediate.clause,
      message: `${prior} immediate retest${prior === 1 ? '' : 's'} already made of this test: a further retest needs proof of further training (record it as a retest after training).`,
    });
  if (r.basis === 'immediate' && rule.volumetric && r.failedKind === 'volumetric' && !own.volumetric)
    reasons.push({ clause: rule.volumetric.clause, message: rule.volumetric.message });
  return { result: reasons.length > 0 ? 'incomplete' : 'accept', reasons, notes, set };
}

/** One coupon recorded as a retest of a failed coupon. */
export type RetestCoupon = { id: string; basis: RetestBasis; result: CouponResult };

/**
 * The retest a coupon belongs to among every retest of its failed coupon (`rows`, in the order tested):
 * immediate coupons form sets of the code's size in that order (an immediate retest of two coupons is the
 * next two), a retest after training stands alone. `own` is the coupon being judged: it replaces its row,
 * or comes last when new. Returns the set's coupons (own included), its verdict and the immediate sets
 * made before it (API 1104 allows one).
 */
export function retestSetOf<T extends RetestCoupon>(
  code: CodeId,
  rows: T[],
  own: T,
): { coupons: T[]; verdict: RetestSetVerdict; priorSets: number } {
  const at = rows.findIndex((r) => r.id === own.id);
  const all = at >= 0 ? rows.map((r, i) => (i === at ? own : r)) : [...rows, own];
  const immediate = all.filter((r) => r.basis === 'immediate');
  const n = RETEST_RULES[code].immediate.coupons;
  if (own.basis !== 'immediate')
    return {
      coupons: [own],
      verdict: retestSetVerdict(code, own.basis, [own.result]),
      priorSets: Math.ceil(immediate.length / n),
    };
  const set = Math.floor(immediate.findIndex((r) => r.id === own.id) / n);
  const coupons = immediate.slice(set * n, set * n + n);
  return { coupons, verdict: retestSetVerdict(code, 'immediate', coupons.map((r) => r.result)), priorSets: set };
}

/** What failed on a test: a retest's examination follows it (QW-321.1 to QW-321.3). */
export function failedKindOf(failed: {
  visual: string;
  evaluation: { parts?: Array<{ kind: string; result: string }> } | null;
}): NonNullable<Retest['failedKind']> {
  if (failed.visual === 'reject') return 'visual';
  const parts = failed.evaluation?.parts ?? [];
  if (parts.some((p) => (p.kind === 'radiography' || p.kind === 'ultrasonic') && p.result === 'reject'))
    return 'volumetric';
  return 'mechanical';
}
