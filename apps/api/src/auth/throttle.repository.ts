// Sign-in throttle rows (see migration 1765500000001-sign-in-throttle). Plain values out.
import type { EntityManager } from 'typeorm';

export type ThrottleKind = 'account' | 'address';
export interface ThrottleKey {
  kind: ThrottleKind;
  key: string;
  /** Refused passwords within the window after which the key is held back. */
  limit: number;
}

export const WINDOW_MINUTES = 15;
const MAX_HOLD_MINUTES = 15;

/** The latest moment until which any of the keys is held back, or null. One indexed read. */
export async function heldUntil(db: EntityManager, keys: ThrottleKey[], now: Date): Promise<Date | null> {
  const rows: { until: Date | null }[] = await db.query(
    `SELECT max(held_until) AS until FROM sign_in_throttle
      WHERE (kind, key) IN (SELECT * FROM unnest($1::text[], $2::text[])) AND held_until > $3`,
    [keys.map((k) => k.kind), keys.map((k) => k.key), now],
  );
  return rows[0]?.until ?? null;
}

// A window older than 15 minutes (and not holding the key back) starts again at this failure.
const FRESH = `(t.window_started_at < $4::timestamptz - interval '${WINDOW_MINUTES} minutes' AND (t.held_until IS NULL OR t.held_until <= $4))`;
const NEXT = `(CASE WHEN ${FRESH} THEN 1 ELSE t.failures + 1 END)`;
const hold = (failures: string) =>
  `$4::timestamptz + least(${MAX_HOLD_MINUTES}, power(2, least(10, ${failures} - $3))) * interval '1 minute'`;

/**
 * Counts one refused password against each key: from its limit on, a key is held back for
 * 2^(failures − limit) minutes (1, 2, 4 …), at most 15.
 */
export async function recordFailure(db: EntityManager, keys: ThrottleKey[], now: Date): Promise<void> {
  for (const k of keys)
    await db.query(
      `INSERT INTO sign_in_throttle AS t (kind, key, failures, window_started_at, held_until)
       VALUES ($1, $2, 1, $4, CASE WHEN 1 >= $3 THEN ${hold('1')} END)
       ON CONFLICT (kind, key) DO UPDATE SET
         failures = ${NEXT},
         window_started_at = CASE WHEN ${FRESH} THEN $4 ELSE t.window_started_at END,
         held_until = CASE WHEN ${NEXT} >= $3 THEN ${hold(NEXT)} ELSE t.held_until END`,
      [k.kind, k.key, k.limit, now],
    );
}

/** Forgets an account's failures: after a successful sign-in, or a password set through an e-mailed link. */
export async function clearAccount(db: EntityManager, email: string): Promise<void> {
  await db.query(`DELETE FROM sign_in_throttle WHERE kind = 'account' AND key = $1`, [email]);
}
