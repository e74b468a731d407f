// The maintained continuity state of each (welder, process, code) pair, and the one set-based walk that
// computes it. The walk reproduces the rules package's continuityStatus (TRADE.md §6, §9) with window
// functions. Evidence per code (DEVELOPERS.md "What counts as evidence"): a certified passing coupon of
// the pair's own code is a test; any other passing coupon of the process (another code, or not yet
// certified) and every logged use from any shop are use. A combination coupon (QW-306) is evidence for each
// of its processes (coupons.processes). In date order, a test before a use on the same
// day; a use counts while it comes before the lapse date computed from the previous evidence; once a gap
// reaches the lapse date every later use is ignored (and flagged) until the next test, which renews the
// pair. Revocation is applied inside the walk: when every qualification of the pair in force (not
// superseded) is revoked, the pair's revocation date is the latest of them; evidence on or after it
// counts for nothing (use is flagged) and the pair lapses on it at the latest, so every reader of
// lapses_on (lapse scan, Overview, soonest lapse, grid) sees a future-dated revocation the same way.
// The lapse date of each code is the rules package's own PostgreSQL expression (lapseRules[code].sql),
// so the SQL and the function cannot drift apart on the calendar arithmetic.
//
// A pair exists for every code and process the welder holds a certified qualification for (superseded
// and revoked ones too, so every qualification has a state); its qualification date is the earliest test
// date of those qualifications.
import type { EntityManager } from 'typeorm';
import { codeIds, DEFAULT_COMPANY_SETTINGS, lapseRules } from '@beadroll/rules';

/** lapsesOn of each code from the last counted evidence and the latest counted test (SQL expressions). */
export function lapsesOnSql(code: string, last: string, lastTest: string): string {
  const branches = codeIds.map((id) => {
    const sql = lapseRules[id].sql.replaceAll(':lastTest', `(${lastTest})`).replaceAll(':last', `(${last})`);
    return `WHEN '${id}' THEN ${sql}`;
  });
  return `(CASE ${code} ${branches.join(' ')} END)`;
}

const testOrUse = `CASE WHEN c.code = p.code AND EXISTS (SELECT 1 FROM qualifications t WHERE t.coupon_id = c.id)
                        THEN 0 ELSE 1 END`;

/**
 * The pair's evidence inside its life (on or after the qualification date, before its revocation):
 * passing coupons of the process (a test of the pair when certified under its code, else use) and every
 * logged use of the process from any shop.
 */
function evidenceInLifeSql(cut: (col: string) => string, entries: boolean): string {
  const inLife = (d: string) => `${d} >= p.qualified_on AND (p.revoked_on IS NULL OR ${d} < p.revoked_on)`;
  return `
    SELECT p.pair_no, p.code, p.qualified_on, c.tested_on AS d, ${testOrUse} AS k, NULL::uuid AS entry_id
      FROM pairs p
      JOIN coupons c ON c.welder_id = p.welder_id AND p.process = ANY (c.processes) AND c.result = 'accept'
                    AND ${inLife('c.tested_on')} ${cut('c.tested_on')}
    UNION ALL
    SELECT p.pair_no, p.code, p.qualified_on, e.used_on, 1, ${entries ? 'e.id' : 'NULL::uuid'}
      FROM pairs p
      JOIN continuity_entries e ON e.welder_id = p.welder_id AND e.process = p.process
                               AND ${inLife('e.used_on')} ${cut('e.used_on')}
    UNION ALL
    SELECT p.pair_no, p.code, p.qualified_on, wp.welded_on, 1, ${entries ? 'wp.id' : 'NULL::uuid'}
      FROM pairs p
      JOIN weld_passes wp ON wp.welder_id = p.welder_id AND wp.process = p.process
                         AND ${inLife('wp.welded_on')} ${cut('wp.welded_on')}
     WHERE ${weldDayIsNew('wp')}`;
}

/**
 * A production weld is use of its process on the day welded, once per (welder, process, day): a day a
 * logged entry already covers, or another weld of the same day, adds nothing (one evidence model, no
 * double counting). Both reached through the (welder_id, process, day) indexes.
 */
const weldDayIsNew = (wp: string) => `
  NOT EXISTS (SELECT 1 FROM continuity_entries e2
               WHERE e2.welder_id = ${wp}.welder_id AND e2.process = ${wp}.process AND e2.used_on = ${wp}.welded_on)
  AND NOT EXISTS (SELECT 1 FROM weld_passes w2
                   WHERE w2.welder_id = ${wp}.welder_id AND w2.process = ${wp}.process
                     AND w2.welded_on = ${wp}.welded_on AND w2.id < ${wp}.id)`;

/**
 * The evidence outside the pair's life, which counts for nothing (logged use there is flagged). Rare, so
 * the logged use is reached per pair through the (welder_id, process, used_on) index (OFFSET 0 keeps each
 * lateral lookup a range scan instead of one hash of every entry).
 */
function evidenceOutsideLifeSql(cut: (col: string) => string): string {
  const entries = (from: string, when: string) => `
    SELECT p.pair_no, e.used_on AS d, 1 AS k, e.id AS entry_id
      FROM ${from} p
      CROSS JOIN LATERAL (SELECT e.used_on, e.id FROM continuity_entries e
                           WHERE e.welder_id = p.welder_id AND e.process = p.process AND ${when} ${cut('e.used_on')}
                          OFFSET 0) e`;
  return `
    SELECT p.pair_no, c.tested_on AS d, ${testOrUse} AS k, NULL::uuid AS entry_id
      FROM pairs p
      JOIN coupons c ON c.welder_id = p.welder_id AND p.process = ANY (c.processes) AND c.result = 'accept'
                    AND (c.tested_on < p.qualified_on OR c.tested_on >= p.revoked_on) ${cut('c.tested_on')}
    UNION ALL ${entries('pairs', 'e.used_on < p.qualified_on')}
    UNION ALL ${entries('(SELECT * FROM pairs WHERE revoked_on IS NOT NULL)', 'e.used_on >= p.revoked_on')}
    UNION ALL
    SELECT p.pair_no, wp.welded_on, 1, wp.id
      FROM pairs p
      JOIN weld_passes wp ON wp.welder_id = p.welder_id AND wp.process = p.process
                         AND (wp.welded_on < p.qualified_on OR wp.welded_on >= p.revoked_on) ${cut('wp.welded_on')}
     WHERE ${weldDayIsNew('wp')}`;
}

interface WalkOptions {
  /** Extra conditions on the qualifications `q` that make the pairs (e.g. one welder and process). */
  pairFilter?: string;
  /** Evidence after this date plays no part (a SQL expression of type date); omitted: all evidence. */
  asOf?: string;
  /** Carry each logged use's id through the walk (the timeline needs it; the states do not, and a
   * narrower row sorts faster). */
  entries?: boolean;
}

/**
 * The walk as CTEs: `pairs`, `walk` (one row per evidence with its flags) and `computed` (one row per
 * pair with the state). Callers add their own final SELECT / INSERT.
 */
export function walkCtes({ pairFilter = '', asOf, entries = false }: WalkOptions = {}): string {
  const cut = (col: string) => (asOf ? `AND ${col} <= ${asOf}` : '');
  const f = (last: string, lastTest: string) => lapsesOnSql('code', last, lastTest);
  const counted = '(w3.k = 0 OR NOT w3.broken)';
  const renewal = '(w3.k = 0 AND (w3.gap OR w3.prev_broken))';
  return `
  pairs AS (
    -- pair_no: a small number per pair, the walk's partition key (cheaper to sort on than welder, process, code).
    SELECT row_number() OVER () AS pair_no, q.organization_id, q.welder_id, q.process, q.code, min(c.tested_on) AS qualified_on,
           CASE WHEN bool_and(q.revoked_on IS NOT NULL) FILTER (WHERE q.superseded_by_id IS NULL)
                THEN max(q.revoked_on) FILTER (WHERE q.superseded_by_id IS NULL) END AS revoked_on
      FROM qualifications q JOIN coupons c ON c.id = q.coupon_id
     WHERE true ${pairFilter}
     GROUP BY q.organization_id, q.welder_id, q.process, q.code
  ),
  ev_in AS (${evidenceInLifeSql(cut, entries)}),
  ev_out AS (${evidenceOutsideLifeSql(cut)}),
  -- The walk proper runs over the evidence inside the pair's life only, one window partition per pair,
  -- so the per-pair aggregate below reads the windows' own order and needs no second sort.
  w1 AS (
    SELECT ev.*, row_number() OVER w AS rn,
           lag(ev.d, 1, ev.qualified_on) OVER w AS prev,
           coalesce(max(ev.d) FILTER (WHERE ev.k = 0) OVER (w ROWS BETWEEN UNBOUNDED PRECEDING AND 1 PRECEDING),
                    ev.qualified_on) AS test_before
      FROM ev_in ev
    WINDOW w AS (PARTITION BY ev.pair_no ORDER BY ev.d, ev.k)
  ),
  w2 AS (
    SELECT w1.*, ${f('w1.prev', 'w1.test_before')} AS lapse_if_gap,
           w1.d >= ${f('w1.prev', 'w1.test_before')} AS gap
      FROM w1
  ),
  w3 AS (
    -- broken: a use after a gap that no later test has healed yet; prev_broken: the same of the row
    -- before (computed here from the rows up to it, so the next level needs no lag and no new sort).
    SELECT w2.*,
           w2.k = 1 AND coalesce(
             max(CASE WHEN w2.k = 1 AND w2.gap THEN w2.rn END) OVER upto
               > coalesce(max(CASE WHEN w2.k = 0 THEN w2.rn END) OVER upto, 0),
             false) AS broken,
           coalesce(lag(w2.k) OVER upto = 1 AND
             max(CASE WHEN w2.k = 1 AND w2.gap THEN w2.rn END) OVER before
               > coalesce(max(CASE WHEN w2.k = 0 THEN w2.rn END) OVER before, 0),
             false) AS prev_broken
      FROM w2
    WINDOW upto AS (PARTITION BY w2.pair_no ORDER BY w2.d, w2.k
                    ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW),
           before AS (PARTITION BY w2.pair_no ORDER BY w2.d, w2.k
                      ROWS BETWEEN UNBOUNDED PRECEDING AND 1 PRECEDING)
  ),
  inlife AS NOT MATERIALIZED (
    -- Each row's verdict, and (whole-partition frames, computed once per pair, in the walk's own order so
    -- nothing is sorted twice) the pair's totals, carried on every row and read off its first.
    SELECT w3.pair_no, w3.d, w3.k, w3.entry_id, w3.rn,
           ${counted} AS counted, ${renewal} AS renewal,
           CASE WHEN w3.gap AND NOT w3.prev_broken THEN w3.lapse_if_gap END AS lapsed_on,
           max(w3.d) FILTER (WHERE ${counted}) OVER pair AS last_evidence,
           max(w3.d) FILTER (WHERE ${counted} AND w3.k = 0) OVER pair AS last_test,
           max(w3.d) FILTER (WHERE ${renewal}) OVER pair AS renewed_on,
           array_agg(w3.d) FILTER (WHERE NOT ${counted}) OVER pair AS ignored
      FROM w3
    WINDOW pair AS (PARTITION BY w3.pair_no ORDER BY w3.d, w3.k
                    ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING)
  ),
  walk AS (
    SELECT p.welder_id, p.process, p.code, x.d, x.k, x.entry_id, x.pre, x.counted, x.renewal, x.lapsed_on
      FROM (SELECT pair_no, d, k, entry_id, false AS pre, counted, renewal, lapsed_on FROM inlife
            UNION ALL
            SELECT pair_no, d, k, entry_id, true, false, false, NULL::date FROM ev_out) x
      JOIN pairs p USING (pair_no)
  ),
  outside AS (
    SELECT pair_no, array_agg(d) AS ds FROM ev_out GROUP BY pair_no
  ),
  agg AS (
    SELECT pair_no, last_evidence, last_test, renewed_on, ignored FROM inlife WHERE rn = 1
  ),
  computed0 AS (
    SELECT p.organization_id, p.welder_id, p.process, p.code, p.qualified_on, p.revoked_on,
           coalesce(a.last_evidence, p.qualified_on) AS last_evidence,
           coalesce(a.last_test, p.qualified_on) AS last_test,
           a.renewed_on,
           -- Use outside the pair's life and use after a lapse, in date order.
           CASE WHEN o.ds IS NULL THEN coalesce(a.ignored, '{}'::date[])
                ELSE ARRAY(SELECT x FROM unnest(coalesce(a.ignored, '{}'::date[]) || o.ds) AS x ORDER BY x) END AS ignored
      FROM pairs p LEFT JOIN agg a USING (pair_no)
      LEFT JOIN outside o USING (pair_no)
  ),
  computed AS (
    SELECT c.*, least(${f('c.last_evidence', 'c.last_test')}, c.revoked_on) AS lapses_on FROM computed0 c
  )`;
}

/** The (welder, process) keys a change touched; every code the welder holds for the process is refreshed. */
export interface PairKey {
  welderId: string;
  process: string;
}

const flagSql = (entryFilter: string) => `
  UPDATE continuity_entries e
     SET flagged_lapsed = f.flag,
         -- A newly flagged entry waits for review even if an earlier flag of it was reviewed: the review
         -- was of other facts. An entry no longer flagged has nothing to review.
         review_status = CASE WHEN f.flag THEN 'pending' END,
         review_decision = NULL
    FROM (SELECT x.id, EXISTS (SELECT 1 FROM continuity_states s
                                WHERE s.welder_id = x.welder_id AND s.process = x.process
                                  AND x.used_on >= s.qualified_on AND x.used_on = ANY (s.ignored)) AS flag
            FROM continuity_entries x WHERE ${entryFilter}) f
   WHERE e.id = f.id AND e.flagged_lapsed IS DISTINCT FROM f.flag`;

const upsertStatesSql = `
  INSERT INTO continuity_states AS s
         (welder_id, process, code, organization_id, qualified_on, last_evidence, last_test, lapses_on,
          renewed_on, ignored, updated_at)
  SELECT welder_id, process, code, organization_id, qualified_on, last_evidence, last_test, lapses_on,
         renewed_on, ignored, now()
    FROM computed
  ON CONFLICT (welder_id, process, code) DO UPDATE SET
         organization_id = EXCLUDED.organization_id, qualified_on = EXCLUDED.qualified_on,
         last_evidence = EXCLUDED.last_evidence, last_test = EXCLUDED.last_test,
         lapses_on = EXCLUDED.lapses_on, renewed_on = EXCLUDED.renewed_on, ignored = EXCLUDED.ignored,
         updated_at = now()
   WHERE (s.qualified_on, s.last_evidence, s.last_test, s.lapses_on, s.renewed_on, s.ignored)
         IS DISTINCT FROM (EXCLUDED.qualified_on, EXCLUDED.last_evidence, EXCLUDED.last_test,
                           EXCLUDED.lapses_on, EXCLUDED.renewed_on, EXCLUDED.ignored)`;

/**
 * welders.soonest_lapses_on of the welders matching `welderFilter` (on `u.welder_id`, from `source`): the
 * soonest effective lapse date (qualificationLapsesOnSql: the pair's lapsesOn, at most the qualification's
 * own revocation, past or future) among their qualifications not superseded — the Welders list's sort key,
 * kept with the states. Callers hold the welders' continuity lock (lockPairs), so the minimum is taken
 * from a snapshot that includes every other refresh of the welder.
 */
const soonestLapseSql = (source: string) => `
  UPDATE welders w SET soonest_lapses_on = x.m
    FROM (SELECT u.welder_id,
                 (SELECT min(least(cs.lapses_on, q.revoked_on)) FROM qualifications q
                    JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
                   WHERE q.welder_id = u.welder_id AND q.superseded_by_id IS NULL) AS m
            FROM ${source}) x
   WHERE w.id = x.welder_id AND w.soonest_lapses_on IS DISTINCT FROM x.m`;

/**
 * A pair whose lapse date moved in a refresh: `before` is the stored lapses_on before the refresh (null: the
 * pair is new), `after` the one stored now (null: the pair is gone). Computed in the refresh's own
 * statement, so a caller can write its lapse events in the same transaction.
 */
export interface LapseMove {
  organizationId: string;
  welderId: string;
  process: string;
  code: string;
  before: string | null;
  after: string | null;
}

/**
 * Recomputes the continuity state of the given pairs in the caller's transaction (four statements
 * whatever their number: lock, upsert/delete, re-flag, the welders' soonest lapse) and re-flags the logged
 * use of those pairs that fell on a lapsed date. Takes a transaction-scoped advisory lock per welder, in a
 * fixed order, so two writers of one welder refresh one after the other and the later one sees both
 * changes (the welder's soonest lapse spans all its processes). Returns the pairs whose lapsesOn moved.
 */
export async function refreshContinuityPairs(
  manager: EntityManager,
  keys: PairKey[],
  code?: string,
): Promise<LapseMove[]> {
  const unique = [...new Map(keys.map((k) => [`${k.welderId}:${k.process}`, k])).values()].sort((a, b) =>
    a.welderId === b.welderId ? a.process.localeCompare(b.process) : a.welderId.localeCompare(b.welderId),
  );
  if (unique.length === 0) return [];
  const welders = unique.map((k) => k.welderId);
  const processes = unique.map((k) => k.process);
  await lockPairs(manager, unique);
  const keySet = `(SELECT * FROM unnest($1::uuid[], $2::text[]) AS k(welder_id, process))`;
  const codeFilter = (a: string) => (code ? `AND ${a}.code = $3` : '');
  const params: unknown[] = code ? [welders, processes, code] : [welders, processes];
  // Every CTE reads the same snapshot, so `old` holds the states as they were before this statement.
  const moves = await manager.query<LapseMove[]>(
    `WITH ${walkCtes({ pairFilter: `AND (q.welder_id, q.process) IN ${keySet} ${codeFilter('q')}` })},
     old AS (
       SELECT s.organization_id, s.welder_id, s.process, s.code, s.lapses_on FROM continuity_states s
        WHERE (s.welder_id, s.process) IN ${keySet} ${codeFilter('s')}
     ),
     upserted AS (${upsertStatesSql} RETURNING s.organization_id, s.welder_id, s.process, s.code, s.lapses_on),
     deleted AS (
       DELETE FROM continuity_states s
        WHERE (s.welder_id, s.process) IN ${keySet} ${codeFilter('s')}
          AND NOT EXISTS (SELECT 1 FROM computed c WHERE (c.welder_id, c.process, c.code) = (s.welder_id, s.process, s.code))
       RETURNING s.welder_id, s.process, s.code
     )
     SELECT coalesce(u.organization_id, o.organization_id) AS "organizationId",
            coalesce(u.welder_id, o.welder_id) AS "welderId", coalesce(u.process, o.process) AS process,
            coalesce(u.code, o.code) AS code,
            to_char(o.lapses_on, 'YYYY-MM-DD') AS before,
            CASE WHEN d.welder_id IS NULL THEN to_char(coalesce(u.lapses_on, o.lapses_on), 'YYYY-MM-DD') END AS after
       FROM upserted u
       FULL JOIN old o USING (welder_id, process, code)
       LEFT JOIN deleted d ON (d.welder_id, d.process, d.code) = (o.welder_id, o.process, o.code)
      WHERE (u.welder_id IS NOT NULL OR d.welder_id IS NOT NULL)
        AND (CASE WHEN d.welder_id IS NULL THEN u.lapses_on END) IS DISTINCT FROM o.lapses_on
      ORDER BY 2, 3, 4`,
    params,
  );
  // Use logged on a date the pair had already lapsed is not evidence: flag it for the QA manager's review.
  // The ANY lets the planner reach the pairs' entries through the (welder_id, process, used_on) index.
  await manager.query(flagSql(`x.welder_id = ANY ($1::uuid[]) AND (x.welder_id, x.process) IN ${keySet}`), [
    welders,
    processes,
  ]);
  await manager.query(soonestLapseSql(`(SELECT DISTINCT unnest($1::uuid[]) AS welder_id) u`), [welders]);
  return moves;
}

/**
 * Takes the per-welder continuity advisory locks in a fixed order (callers lock before they write). Per
 * welder, not per (welder, process): the welder's soonest lapse is computed from all its processes, so two
 * refreshes of one welder must not run side by side; a transaction that refreshes twice (a coupon moved
 * to another process) holds the one lock throughout and cannot deadlock against itself.
 */
export async function lockPairs(manager: EntityManager, keys: PairKey[]): Promise<void> {
  const sorted = [...new Set(keys.map((k) => k.welderId))].sort();
  await manager.query(
    `SELECT pg_advisory_xact_lock(hashtextextended('continuity:' || w, 0))
       FROM unnest($1::uuid[]) WITH ORDINALITY AS k(w, n) ORDER BY n`,
    [sorted],
  );
}

/** Every code the welder holds for the process, in the caller's transaction. */
export function refreshContinuityStates(
  manager: EntityManager,
  welderId: string,
  process: string,
): Promise<LapseMove[]> {
  return refreshContinuityPairs(manager, [{ welderId, process }]);
}

/** The contract's entry point: one pair (welder, process, code), in the caller's transaction. */
export function refreshContinuityState(
  manager: EntityManager,
  welderId: string,
  process: string,
  code: string,
): Promise<LapseMove[]> {
  return refreshContinuityPairs(manager, [{ welderId, process }], code);
}

/** Every pair of a company (or of all companies), in one statement: the seed and the bench use it. */
export async function refreshAllContinuityStates(manager: EntityManager, organizationId?: string): Promise<void> {
  const params = organizationId ? [organizationId] : [];
  await manager.query(
    `WITH ${walkCtes({ pairFilter: organizationId ? 'AND q.organization_id = $1' : '' })} ${upsertStatesSql}`,
    params,
  );
  await manager.query(flagSql(organizationId ? 'x.organization_id = $1' : 'true'), params);
  await manager.query(
    soonestLapseSql(`(SELECT id AS welder_id FROM welders ${organizationId ? 'WHERE organization_id = $1' : ''}) u`),
    params,
  );
}

export interface RecomputedState {
  welderId: string;
  process: string;
  code: string;
  organizationId: string;
  qualifiedOn: string;
  lastEvidence: string;
  lastTest: string;
  lapsesOn: string;
  renewedOn: string | null;
  ignored: string[];
}

const stateColumns = (a: string) => `
  ${a}.welder_id AS "welderId", ${a}.process, ${a}.code, ${a}.organization_id AS "organizationId",
  to_char(${a}.qualified_on, 'YYYY-MM-DD') AS "qualifiedOn", to_char(${a}.last_evidence, 'YYYY-MM-DD') AS "lastEvidence",
  to_char(${a}.last_test, 'YYYY-MM-DD') AS "lastTest", to_char(${a}.lapses_on, 'YYYY-MM-DD') AS "lapsesOn",
  to_char(${a}.renewed_on, 'YYYY-MM-DD') AS "renewedOn",
  ARRAY(SELECT to_char(x, 'YYYY-MM-DD') FROM unnest(${a}.ignored) WITH ORDINALITY AS u(x, n) ORDER BY n) AS ignored`;

/** The full recompute of every pair (of one company or welder, or all) as of a date (default: all evidence). */
export async function recomputeAll(
  manager: EntityManager,
  opts: { organizationId?: string; welderId?: string; asOf?: string } = {},
): Promise<RecomputedState[]> {
  const params: string[] = [];
  let pairFilter = '';
  if (opts.organizationId) {
    params.push(opts.organizationId);
    pairFilter = `AND q.organization_id = $${params.length}`;
  }
  if (opts.welderId) {
    params.push(opts.welderId);
    pairFilter += ` AND q.welder_id = $${params.length}`;
  }
  let asOf: string | undefined;
  if (opts.asOf) {
    params.push(opts.asOf);
    asOf = `$${params.length}::date`;
  }
  return manager.query(
    `WITH ${walkCtes({ pairFilter, ...(asOf ? { asOf } : {}) })}
     SELECT ${stateColumns('c')} FROM computed c ORDER BY c.welder_id, c.process, c.code`,
    params,
  );
}

/**
 * The full recompute of every pair, materialized once into a temporary table `recomputed` that lives until
 * the caller's transaction ends, so the three checks below share one walk. Call inside a transaction.
 */
export async function materializeRecompute(manager: EntityManager): Promise<void> {
  await manager.query(`DROP TABLE IF EXISTS pg_temp.recomputed`);
  await manager.query(
    `CREATE TEMPORARY TABLE recomputed ON COMMIT DROP AS WITH ${walkCtes()}
     SELECT organization_id, welder_id, process, code, qualified_on, last_evidence, last_test, lapses_on,
            renewed_on, ignored FROM computed`,
  );
  await manager.query(`CREATE INDEX ON pg_temp.recomputed (welder_id, process, code)`);
  await manager.query(`ANALYZE pg_temp.recomputed`);
}

/** What `continuity:verify` reports: everything stored that differs from one full recompute. */
export interface ContinuityDifferences {
  states: Awaited<ReturnType<typeof differingStates>>;
  soonest: Awaited<ReturnType<typeof differingSoonest>>;
  flags: Awaited<ReturnType<typeof differingFlags>>;
}

/** The three checks of `continuity:verify` from one walk (a transaction of its own when none is open). */
export async function verifyContinuity(manager: EntityManager): Promise<ContinuityDifferences> {
  const run = async (db: EntityManager) => {
    await materializeRecompute(db);
    return { states: await differingStates(db, true), soonest: await differingSoonest(db, true), flags: await differingFlags(db, true) };
  };
  return manager.queryRunner?.isTransactionActive ? run(manager) : manager.transaction(run);
}

/** The recompute a check reads: the materialized one when `materialized`, else the walk itself. */
const source = (materialized: boolean) => (materialized ? '' : `WITH ${walkCtes()}`);
const computedTable = (materialized: boolean) => (materialized ? 'pg_temp.recomputed' : 'computed');

/** Pairs whose stored state differs from the full recompute (or is missing / left over). */
export async function differingStates(
  manager: EntityManager,
  materialized = false,
): Promise<{ welderId: string; process: string; code: string; stored: unknown; recomputed: unknown }[]> {
  return manager.query(
    `${source(materialized)}
     SELECT coalesce(c.welder_id, s.welder_id) AS "welderId", coalesce(c.process, s.process) AS process,
            coalesce(c.code, s.code) AS code,
            CASE WHEN s.welder_id IS NULL THEN NULL ELSE json_build_object(
              'qualifiedOn', s.qualified_on, 'lastEvidence', s.last_evidence, 'lastTest', s.last_test,
              'lapsesOn', s.lapses_on, 'renewedOn', s.renewed_on, 'ignored', s.ignored) END AS stored,
            CASE WHEN c.welder_id IS NULL THEN NULL ELSE json_build_object(
              'qualifiedOn', c.qualified_on, 'lastEvidence', c.last_evidence, 'lastTest', c.last_test,
              'lapsesOn', c.lapses_on, 'renewedOn', c.renewed_on, 'ignored', c.ignored) END AS recomputed
       FROM ${computedTable(materialized)} c
       FULL JOIN continuity_states s USING (welder_id, process, code)
      WHERE (c.qualified_on, c.last_evidence, c.last_test, c.lapses_on, c.renewed_on, c.ignored, c.organization_id)
            IS DISTINCT FROM
            (s.qualified_on, s.last_evidence, s.last_test, s.lapses_on, s.renewed_on, s.ignored, s.organization_id)
      ORDER BY 1, 2, 3`,
  );
}

/** Welders whose stored soonest_lapses_on differs from the one the full recompute gives. */
export async function differingSoonest(
  manager: EntityManager,
  materialized = false,
): Promise<{ welderId: string; stored: string | null; recomputed: string | null }[]> {
  return manager.query(
    `${materialized ? 'WITH' : `WITH ${walkCtes()},`}
     soonest AS (
       SELECT q.welder_id, min(least(c.lapses_on, q.revoked_on)) AS m
         FROM qualifications q JOIN ${computedTable(materialized)} c
           ON (c.welder_id, c.process, c.code) = (q.welder_id, q.process, q.code)
        WHERE q.superseded_by_id IS NULL GROUP BY q.welder_id
     )
     SELECT w.id AS "welderId", to_char(w.soonest_lapses_on, 'YYYY-MM-DD') AS stored,
            to_char(x.m, 'YYYY-MM-DD') AS recomputed
       FROM welders w LEFT JOIN soonest x ON x.welder_id = w.id
      WHERE w.soonest_lapses_on IS DISTINCT FROM x.m ORDER BY 1`,
  );
}

/**
 * Logged use whose review flag differs from the full recompute: flagged when (and only when) some pair of
 * its welder and process ignored its date on or after the qualification date; a flagged entry waits for
 * review or has been reviewed, an unflagged one has no review status.
 */
export async function differingFlags(
  manager: EntityManager,
  materialized = false,
): Promise<{ entryId: string; flaggedLapsed: boolean; reviewStatus: string | null; recomputedFlag: boolean }[]> {
  return manager.query(
    `${materialized ? 'WITH' : `WITH ${walkCtes()},`}
     -- From each pair's ignored dates to the entries on them (the (welder_id, process, used_on) index),
     -- not every entry against every pair of its welder and process.
     expected AS (
       SELECT DISTINCT e.id FROM ${computedTable(materialized)} c
        CROSS JOIN LATERAL unnest(c.ignored) AS x(d)
        JOIN continuity_entries e ON e.welder_id = c.welder_id AND e.process = c.process AND e.used_on = x.d
        WHERE x.d >= c.qualified_on
     )
     SELECT e.id AS "entryId", e.flagged_lapsed AS "flaggedLapsed", e.review_status AS "reviewStatus",
            x.id IS NOT NULL AS "recomputedFlag"
       FROM continuity_entries e LEFT JOIN expected x ON x.id = e.id
      WHERE e.flagged_lapsed IS DISTINCT FROM (x.id IS NOT NULL)
         OR (e.flagged_lapsed AND e.review_status IS NULL)
         OR (NOT e.flagged_lapsed AND e.review_status IS NOT NULL)
      ORDER BY 1`,
  );
}

/** The stored states of a company, for the agreement test and the timeline. */
export async function storedStates(
  manager: EntityManager,
  f: { organizationId: string; welderId?: string },
): Promise<RecomputedState[]> {
  return manager.query(
    `SELECT ${stateColumns('s')} FROM continuity_states s
      WHERE s.organization_id = $1 ${f.welderId ? 'AND s.welder_id = $2' : ''}
      ORDER BY s.welder_id, s.process, s.code`,
    f.welderId ? [f.organizationId, f.welderId] : [f.organizationId],
  );
}

/** One welder's evidence with the walk's verdict on each row, for the timeline. */
export async function welderWalk(
  manager: EntityManager,
  welderId: string,
): Promise<
  {
    process: string;
    code: string;
    date: string;
    kind: 'test' | 'use';
    entryId: string | null;
    counted: boolean;
    renewal: boolean;
    lapsedOn: string | null;
  }[]
> {
  return manager.query(
    `WITH ${walkCtes({ pairFilter: 'AND q.welder_id = $1', entries: true })}
     SELECT process, code, to_char(d, 'YYYY-MM-DD') AS date, CASE WHEN k = 0 THEN 'test' ELSE 'use' END AS kind,
            entry_id AS "entryId", counted, renewal, to_char(lapsed_on, 'YYYY-MM-DD') AS "lapsedOn"
       FROM walk ORDER BY process, code, d, k`,
    [welderId],
  );
}

/**
 * The SQL of a qualification's state as of a date, from its row `q` and its pair's state `cs` — the same
 * decision as qualificationStatus in the qualifications service: revoked from revoked_on; else lapsed
 * when lapses_on <= asOf; lapsing within warnDays; else current.
 */
export function qualificationStateSql(q: string, cs: string, asOf: string, warnDays: string): string {
  const lapses = qualificationLapsesOnSql(q, cs);
  return `(CASE WHEN ${q}.revoked_on IS NOT NULL AND ${q}.revoked_on <= ${asOf} THEN 'revoked'
               WHEN ${lapses} <= ${asOf} THEN 'lapsed'
               WHEN ${lapses} - ${asOf} <= ${warnDays} THEN 'lapsing'
               ELSE 'current' END)`;
}

/** lapsesOn of a qualification: its pair's, at most its revocation date (from memory: QW-322.1(b)). */
export function qualificationLapsesOnSql(q: string, cs: string): string {
  return `least(coalesce(${cs}.lapses_on, (SELECT c.tested_on FROM coupons c WHERE c.id = ${q}.coupon_id)), ${q}.revoked_on)`;
}

/** The company's largest lead time in days (company settings, L's table; the default when unset). */
export function companyWarnDaysSql(organizationId: string): string {
  const fallback = Math.max(...DEFAULT_COMPANY_SETTINGS.warnDays);
  return `coalesce((SELECT max(x) FROM company_settings st, unnest(st.warn_days) AS x
                     WHERE st.organization_id = ${organizationId}), ${fallback})`;
}
