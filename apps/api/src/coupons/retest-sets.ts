// The retest as a whole (QW-321, AWS D1.1 retest, API 1104 retest) over the rows of retestsOf: the rules'
// retestSetOf groups every coupon recorded as a retest of one failed coupon as the code makes them (an
// immediate retest of two coupons is the next two immediate coupons in the order tested) and judges the
// set. Certification of a retest waits for the whole set to pass; the coupon page shows it.
import { retestSetOf as groupRetests, type CodeId, type RetestSetVerdict } from '@beadroll/rules';
import type { RetestRow } from './coupons.repository.js';

export type RetestSet = {
  verdict: RetestSetVerdict;
  coupons: Array<Pick<RetestRow, 'id' | 'testedOn' | 'result' | 'qualificationId'>>;
  /** Sets of immediate retests made of the failed coupon before this one (API 1104 allows one). */
  priorSets: number;
};

/** The set of `own` among the retests of its failed coupon (`rows`, in tested order; a new coupon comes last). */
export function retestSetOf(
  code: CodeId,
  rows: RetestRow[],
  own: Pick<RetestRow, 'id' | 'basis' | 'result' | 'testedOn'>,
): RetestSet {
  const existing = rows.find((r) => r.id === own.id);
  const mine: RetestRow = { retestOfId: '', code, qualificationId: existing?.qualificationId ?? null, ...own };
  const { coupons, verdict, priorSets } = groupRetests(code, rows, mine);
  return {
    verdict,
    coupons: coupons.map(({ id, testedOn, result, qualificationId }) => ({ id, testedOn, result, qualificationId })),
    priorSets,
  };
}
