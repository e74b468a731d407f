// The crew finder's SQL. A company's qualifications of a process share few distinct sets of qualified
// ranges (one per kind of coupon; `ranges_key` is the hash of the set, kept by PostgreSQL). The finder
// reads those keys by a loose scan of the (organization_id, process, ranges_key) index, judges each set
// once with jointWithin, then reads the welders of the sets that fit (or miss by one variable) through the
// same index and their pairs' maintained continuity state (continuity_states.lapses_on), classifying each
// qualification in SQL so only the rows shown leave the database.
import type { EntityManager } from 'typeorm';
import type { QualifiedRanges } from '@beadroll/rules';

const crewScope = `q.organization_id = $1 AND q.process = $2 AND q.superseded_by_id IS NULL`;

/** The distinct range keys of the process among qualifications not superseded (a loose index scan). */
export async function distinctRangeKeys(db: EntityManager, organizationId: string, process: string): Promise<string[]> {
  const rows = await db.query<{ key: string }[]>(
    `WITH RECURSIVE k AS (
       (SELECT q.ranges_key AS key FROM qualifications q WHERE ${crewScope} ORDER BY q.ranges_key LIMIT 1)
       UNION ALL
       SELECT (SELECT q.ranges_key FROM qualifications q WHERE ${crewScope} AND q.ranges_key > k.key
                ORDER BY q.ranges_key LIMIT 1)
         FROM k WHERE k.key IS NOT NULL
     )
     SELECT key FROM k WHERE key IS NOT NULL`,
    [organizationId, process],
  );
  return rows.map((r) => r.key);
}

/** One qualification's ranges for each key (the key is the hash of the ranges: any row will do). */
export async function rangesOf(
  db: EntityManager,
  organizationId: string,
  process: string,
  keys: string[],
): Promise<{ key: string; ranges: QualifiedRanges }[]> {
  if (keys.length === 0) return [];
  return db.query(
    `SELECT k.key, (SELECT q.ranges FROM qualifications q WHERE ${crewScope} AND q.ranges_key = k.key LIMIT 1) AS ranges
       FROM unnest($3::text[]) AS k(key)`,
    [organizationId, process, keys],
  );
}

export interface CrewRow {
  klass: number;
  key: string;
  welder: { id: string; stamp: string; name: string; homeShop: string };
  qualification: { id: string; number: string; code: string };
  lapsesOn: string;
  lastEvidence: string;
  revokedOn: string | null;
  revokedReason: string | null;
}

/** Classes of a qualification against the range, best first (a welder shows under their best). */
export const CLASS = { fits: 0, lapsesInRange: 1, outOfRange: 2, lapsed: 3, revoked: 4 } as const;

const rowJson = `json_build_object(
  'klass', x.klass, 'key', x.ranges_key,
  'welder', json_build_object('id', x.welder_id, 'stamp', x.stamp, 'name', x.name, 'homeShop', x.shop),
  'qualification', json_build_object('id', x.id, 'number', x.number, 'code', x.code),
  'lapsesOn', to_char(x.lapses_on, 'YYYY-MM-DD'), 'lastEvidence', to_char(x.last_evidence, 'YYYY-MM-DD'),
  'revokedOn', to_char(x.revoked_on, 'YYYY-MM-DD'), 'revokedReason', x.revoked_reason)`;

// A qualification's class against the range (NULL: not shown). $3 keys that fit, $6 today, $7 the last day.
const klassOf = (q: string, cs: string) => `CASE WHEN ${q}.ranges_key = ANY ($3::text[]) THEN
         CASE WHEN least(${cs}.lapses_on, ${q}.revoked_on) > $7::date THEN ${CLASS.fits}
              WHEN ${q}.revoked_on <= $7::date THEN ${CLASS.revoked}
              WHEN ${cs}.lapses_on > $6::date THEN ${CLASS.lapsesInRange}
              ELSE ${CLASS.lapsed} END
       WHEN least(${cs}.lapses_on, ${q}.revoked_on) > $7::date THEN ${CLASS.outOfRange}
  END`;
// One number per qualification that sorts best first: its class, then the latest day it stays in force.
const scoreOf = (klass: string, until: string) => `(${klass}) * 1000000 - (${until} - date '2000-01-01')`;

/**
 * The exact counts of the crew and of the near misses, and one page of each. Each welder is judged by
 * their best qualification (class, then in force longest): one hash aggregate over the candidates'
 * index-only rows joined to the maintained continuity state, then a top-N sort for the page; only the
 * welders of the page have their best qualification read back (by their own rows).
 */
export async function crewRows(
  db: EntityManager,
  f: {
    organizationId: string;
    process: string;
    code: string | null;
    shopIds: string[] | null;
    today: string;
    through: string;
    fitting: string[];
    oneOff: string[];
    crewLimit: number;
    crewOffset: number;
    nearLimit: number;
    nearOffset: number;
  },
): Promise<{ crewTotal: number; nearTotal: number; crew: CrewRow[]; near: CrewRow[] }> {
  const [row] = await db.query<{ crewTotal: number; nearTotal: number; crew: CrewRow[] | null; near: CrewRow[] | null }[]>(
    `WITH cand AS (
       SELECT q.welder_id, ${klassOf('q', 'cs')} AS klass, least(cs.lapses_on, q.revoked_on) AS until
         FROM qualifications q
         JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
        WHERE ${crewScope} AND q.ranges_key = ANY ($3::text[] || $4::text[])
          AND ($5::text IS NULL OR q.code = $5) AND q.certified_on <= $6::date
     ),
     per AS (
       SELECT c.welder_id, min(c.klass) AS klass, min(${scoreOf('c.klass', 'c.until')}) AS score
         FROM cand c WHERE c.klass IS NOT NULL GROUP BY c.welder_id
     ),
     ranked AS (
       SELECT p.welder_id, p.klass, p.score, w.stamp, w.name, s.name AS shop
         FROM per p
         JOIN welders w ON w.id = p.welder_id AND w.active
         JOIN shops s ON s.id = w.home_shop_id
        WHERE $8::uuid[] IS NULL OR w.home_shop_id = ANY ($8::uuid[])
     ),
     page AS (
       (SELECT r.* FROM ranked r WHERE r.klass = 0 ORDER BY r.score, r.stamp LIMIT $9 OFFSET $10)
       UNION ALL
       (SELECT r.* FROM ranked r WHERE r.klass > 0 ORDER BY r.score, r.stamp LIMIT $11 OFFSET $12)
     ),
     shown AS (
       SELECT p.*, b.* FROM page p
       CROSS JOIN LATERAL (
         SELECT q.id, q.number, q.code, q.ranges_key, q.revoked_on, q.revoked_reason,
                least(cs.lapses_on, q.revoked_on) AS lapses_on, cs.last_evidence
           FROM qualifications q
           JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
          WHERE ${crewScope} AND q.welder_id = p.welder_id AND q.ranges_key = ANY ($3::text[] || $4::text[])
            AND ($5::text IS NULL OR q.code = $5) AND q.certified_on <= $6::date
            AND ${scoreOf(klassOf('q', 'cs'), 'least(cs.lapses_on, q.revoked_on)')} = p.score
          ORDER BY q.number LIMIT 1
       ) b
     )
     SELECT (SELECT count(*) FROM ranked WHERE klass = 0)::int AS "crewTotal",
            (SELECT count(*) FROM ranked WHERE klass > 0)::int AS "nearTotal",
            (SELECT json_agg(${rowJson} ORDER BY x.score, x.stamp) FROM shown x WHERE x.klass = 0) AS crew,
            (SELECT json_agg(${rowJson} ORDER BY x.score, x.stamp) FROM shown x WHERE x.klass > 0) AS near`,
    [
      f.organizationId, f.process, f.fitting, f.oneOff, f.code, f.today, f.through, f.shopIds,
      f.crewLimit, f.crewOffset, f.nearLimit, f.nearOffset,
    ],
  );
  return { crewTotal: row?.crewTotal ?? 0, nearTotal: row?.nearTotal ?? 0, crew: row?.crew ?? [], near: row?.near ?? [] };
}
