// Lapse events from the refresh itself. Whenever a change (a logged use added, deleted or re-dated, a
// coupon corrected, a certification, a revocation, a renewal) moves a pair's lapses_on, the transaction
// that refreshed the continuity state calls recordLapseMoves with the moves; the notices it writes are
// committed (or rolled back) with the change. The daily run stays as the safety net for the lapses that
// come with the passing of time.
//
// What a move writes, for each qualification in force behind the pair, with T the company's today and
// bands(x) = {'lapsed'} when x <= T, else every lead time d with x - T <= d (empty when none):
//   - bands(after) not empty, and either different from bands(before) or supervisors had been sent a
//     notice of the old date: a notice at each of bands(after) for the new date — "lapses in 5 days",
//     "has in fact been lapsed since March";
//   - bands(after) empty, and supervisors had been sent a notice of the old date: a 'restored' notice
//     ("back in continuity, lapses on …");
//   - otherwise nothing (nobody was told anything that is now wrong).
// A pair that is new (a certification entered after the fact) reports a lapse only within the largest
// lead time, as a first daily run would: entering history does not mail years-old lapses.
// Notices are unique per (qualification, threshold, lapses_on), so a move and a run never both write one.
import type { EntityManager } from 'typeorm';
import type { LapseMove } from '../continuity/continuity-state.repository.js';
import { addDays, daysBetween } from '@beadroll/rules';
import type { Clock } from '../lib/context.js';
import { todayIn } from '../lib/dates.js';
import { settingsOfCompanies } from '../settings/settings.repository.js';
import * as repo from './lapse-watch.repository.js';

/** One pair whose lapses_on a refresh changed (before/after: YYYY-MM-DD, null when there was/is no state). */
export type { LapseMove };

/** The thresholds a lapse date stands at on `today` (see the header). */
export function bandsOf(lapsesOn: string | null, today: string, warnDays: number[]): string[] {
  if (lapsesOn === null) return [];
  if (lapsesOn <= today) return ['lapsed'];
  const left = daysBetween(today, lapsesOn);
  return [...warnDays]
    .sort((a, b) => b - a)
    .filter((d) => left <= d)
    .map(String);
}

const sameBands = (a: string[], b: string[]) => a.length === b.length && a.every((x, i) => x === b[i]);

/** Writes the notices (and their pending deliveries) of these moves in the caller's transaction. */
export async function recordLapseMoves(db: EntityManager, moves: LapseMove[], clock: Clock): Promise<number> {
  const real = moves.filter((m) => m.before !== m.after && m.after !== null);
  if (real.length === 0) return 0;
  const now = clock.now();
  const byCompany = new Map<string, LapseMove[]>();
  for (const m of real) byCompany.set(m.organizationId, [...(byCompany.get(m.organizationId) ?? []), m]);
  const settings = await settingsOfCompanies(db, [...byCompany.keys()]);
  let written = 0;
  for (const [organizationId, list] of byCompany) {
    const s = settings.get(organizationId);
    if (!s) continue;
    const today = todayIn(s.timeZone, now);
    // A move is per pair: every qualification in force of the pair moves with it. (A revocation of one
    // of them is not a lapse: its notices are dropped as superseded, never sent.)
    const quals = await repo.movedQualifications(db, organizationId, today, list);
    const rows: { qualificationId: string; threshold: string; lapsesOn: string }[] = [];
    const oldest = addDays(today, -Math.max(...s.warnDays));
    for (const q of quals) {
      const before = bandsOf(q.before, today, s.warnDays);
      const after = bandsOf(q.after, today, s.warnDays);
      if (q.before === null && q.after <= oldest) continue;
      if (after.length > 0 && (!sameBands(before, after) || q.told))
        for (const threshold of after) rows.push({ qualificationId: q.qualificationId, threshold, lapsesOn: q.after });
      else if (after.length === 0 && q.told)
        rows.push({ qualificationId: q.qualificationId, threshold: 'restored', lapsesOn: q.after });
    }
    written += await repo.insertMoveNotices(db, organizationId, rows, now);
  }
  return written;
}
