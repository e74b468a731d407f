// Import of continuity history: welder stamp, process, the day (or only the month) of use, the job, and
// optionally the shop (default: the welder's home shop) and a note. Each row is checked with the same
// schema as a cell of the Continuity log.
// The log keeps one use per welder, process, shop and month (the grid's cell); several rows for one cell
// fold into it, keeping the latest day (the one that carries continuity furthest) — the report says so.
// A month without a day is refused: use on an unknown day of the month a qualification lapses in may have
// come before the lapse or after it, and Beadroll cannot tell — the row must give the day (DESIGN: the grid
// too asks for an explicit date of use). A change to a reviewed entry waits for review again, and every
// lapse date the import moves raises its lapse notices in the same transaction, as a grid save does.
import { gridSaveInput } from '@beadroll/rules';
import { refreshContinuityPairs } from '../continuity/continuity-state.repository.js';
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import { recheckWelds } from '../welds/welds.service.js';
import {
  addZodIssues,
  batches,
  Columns,
  Findings,
  type FieldDef,
  type ImportPlan,
  type KindDef,
  type PlanContext,
  breathe,
  type Tick,
  shopsByCodeOrName,
  weldersByStamp,
} from './import-plan.js';
import { dateHint, parseDay, parseMonth } from './cells.js';

const cellSchema = gridSaveInput.shape.cells.unwrap().unwrap().element;

const fields: FieldDef[] = [
  { key: 'stamp', label: 'Stamp', required: true, hint: 'The welder’s stamp', aliases: ['welder stamp', 'welder', 'stamp no', 'welder id'] },
  { key: 'process', label: 'Process', required: true, hint: 'SMAW, GTAW, GMAW, FCAW, SAW, PAW or OFW', aliases: ['welding process', 'proc'] },
  { key: 'date', label: 'Date', required: true, hint: 'The day of use', aliases: ['used on', 'date used', 'month', 'day', 'weld date'] },
  { key: 'job', label: 'Job', required: true, hint: 'The job or traveler number', aliases: ['job number', 'job no', 'job reference', 'traveler', 'work order'] },
  { key: 'shop', label: 'Shop', required: false, hint: 'The shop’s code or name (default: the welder’s home shop)', aliases: ['shop code', 'location'] },
  { key: 'note', label: 'Note', required: false, hint: 'Optional', aliases: ['notes', 'remark', 'remarks', 'comment'] },
];

interface Cell {
  line: number;
  welderId: string;
  shopId: string;
  process: string;
  month: string;
  usedOn: string;
  job: string;
  note: string;
}

async function plan(ctx: PlanContext): Promise<ImportPlan> {
  const { db, actor, sheet } = ctx;
  const cols = new Columns(fields, ctx);
  const findings = new Findings();
  const shopByKey = await shopsByCodeOrName(db, actor.organizationId);
  const welders = await weldersByStamp(db, actor.organizationId);

  const cells = new Map<string, Cell>();
  let folded = 0;
  for (const [i, row] of sheet.rows.entries()) {
    if (i % 2000 === 1999) await breathe();
    const stamp = cols.get(row, 'stamp').toUpperCase();
    const welder = welders.get(stamp);
    if (stamp && !welder)
      findings.add(row.line, cols.header('stamp'), `No welder with stamp ${stamp} in your company; import or add the welder first`);
    const dateText = cols.get(row, 'date');
    const usedOn = parseDay(dateText, ctx.dateFormat);
    if (dateText && !usedOn)
      findings.add(
        row.line,
        cols.header('date'),
        parseMonth(dateText)
          ? `“${dateText}” is a month: give the day of use (a month alone cannot show the use came before a lapse in that month)`
          : `“${dateText}” is not a date as ${dateHint[ctx.dateFormat]}`,
      );
    if (usedOn && usedOn > ctx.today) findings.add(row.line, cols.header('date'), `${usedOn} is in the future`);
    const shopText = cols.get(row, 'shop');
    const shopId = shopText ? shopByKey.get(shopText.toLowerCase())?.id : welder?.homeShopId;
    if (shopText && !shopId) findings.add(row.line, cols.header('shop'), `No shop “${shopText}” in your company`);
    const parsed = cellSchema.safeParse({
      welderId: welder?.id ?? '00000000-0000-4000-8000-000000000000',
      process: cols.get(row, 'process').toUpperCase(),
      usedOn: usedOn ?? '2000-01-01',
      jobReference: cols.get(row, 'job'),
      note: cols.get(row, 'note'),
    });
    if (!parsed.success) addZodIssues(findings, cols, row.line, parsed.error, { welderId: 'stamp', usedOn: 'date', jobReference: 'job' });
    if (!stamp) findings.add(row.line, cols.header('stamp'), 'Required');
    if (!dateText) findings.add(row.line, cols.header('date'), 'Required');
    if (findings.has(row.line) || !parsed.success || !welder || !usedOn || !shopId) continue;
    const c = parsed.data;
    const key = `${welder.id}|${c.process}|${shopId}|${usedOn.slice(0, 7)}`;
    const cell: Cell = { line: row.line, welderId: welder.id, shopId, process: c.process, month: `${usedOn.slice(0, 7)}-01`, usedOn, job: c.jobReference, note: c.note };
    const prior = cells.get(key);
    if (prior) {
      folded++;
      if (usedOn > prior.usedOn || (usedOn === prior.usedOn && c.jobReference > prior.job)) cells.set(key, cell);
    } else cells.set(key, cell);
  }
  for (const m of cols.missing()) findings.add(1, null, `Choose the column that holds “${m}”`);
  if (folded > 0)
    findings.notes.push(
      `${folded} row(s) fall in the same welder, process, shop and month as another row; the log keeps one use per month, the latest day.`,
    );

  // Compare with what the log holds for these welders.
  const list = [...cells.values()];
  const existing = new Map<string, { usedOn: string; job: string; note: string }>();
  const welderIds = [...new Set(list.map((c) => c.welderId))];
  for (const b of batches(welderIds, 5000)) {
    const rows = await db.query<{ key: string; usedOn: string; job: string; note: string }[]>(
      `SELECT welder_id || '|' || process || '|' || shop_id || '|' || to_char(month, 'YYYY-MM') AS key,
              to_char(used_on, 'YYYY-MM-DD') AS "usedOn", job_reference AS job, note
         FROM continuity_entries WHERE organization_id = $1 AND welder_id = ANY ($2::uuid[])`,
      [actor.organizationId, b],
    );
    for (const r of rows) existing.set(r.key, r);
  }
  const stampOf = new Map([...welders.values()].map((w) => [w.id, w.stamp]));
  const writes: Cell[] = [];
  for (const [key, c] of cells) {
    const old = existing.get(key);
    if (!old) {
      findings.counts.new++;
      writes.push(c);
    } else if (old.usedOn === c.usedOn && old.job === c.job && old.note === c.note) findings.counts.unchanged++;
    else {
      findings.change(c.line, `${stampOf.get(c.welderId)} ${c.process} ${c.month.slice(0, 7)}`, { usedOn: old.usedOn, job: old.job, note: old.note }, { usedOn: c.usedOn, job: c.job, note: c.note });
      writes.push(c);
    }
  }

  return {
    report: findings.report(sheet.rows.length),
    async apply(db, tick: Tick) {
      let done = 0;
      // Entries the import re-dates: the welds their old day kept in force are re-checked below.
      const moved: { welderId: string; process: string; from: string }[] = [];
      for (const b of batches(writes, 5000)) {
        const before = await db.query<{ welderId: string; process: string; from: string }[]>(
          `SELECT e.welder_id AS "welderId", e.process, to_char(least(e.used_on, u.used_on), 'YYYY-MM-DD') AS "from"
             FROM unnest($2::uuid[], $3::uuid[], $4::text[], $5::date[], $6::date[]) AS u(welder_id, shop_id, process, month, used_on)
             JOIN continuity_entries e ON e.organization_id = $1 AND e.welder_id = u.welder_id AND e.shop_id = u.shop_id
                                      AND e.process = u.process AND e.month = u.month
            WHERE e.used_on <> u.used_on
              FOR UPDATE OF e`,
          [
            actor.organizationId,
            b.map((c) => c.welderId),
            b.map((c) => c.shopId),
            b.map((c) => c.process),
            b.map((c) => c.month),
            b.map((c) => c.usedOn),
          ],
        );
        moved.push(...before);
        await db.query(
          `INSERT INTO continuity_entries AS e
                  (organization_id, welder_id, shop_id, process, month, used_on, job_reference, note, logged_by)
           SELECT $1, u.welder_id, u.shop_id, u.process, u.month, u.used_on, u.job, u.note, $2
             FROM unnest($3::uuid[], $4::uuid[], $5::text[], $6::date[], $7::date[], $8::text[], $9::text[])
                  AS u(welder_id, shop_id, process, month, used_on, job, note)
           ON CONFLICT ON CONSTRAINT continuity_entries_cell_key DO UPDATE
              SET used_on = EXCLUDED.used_on, job_reference = EXCLUDED.job_reference, note = EXCLUDED.note,
                  logged_by = EXCLUDED.logged_by, updated_at = now(), version = e.version + 1,
                  -- A reviewed entry that is changed is a new statement of fact: it waits for review again.
                  review_status = CASE WHEN e.review_status = 'reviewed' THEN 'pending' ELSE e.review_status END,
                  review_decision = NULL
            WHERE (e.used_on, e.job_reference, e.note) IS DISTINCT FROM (EXCLUDED.used_on, EXCLUDED.job_reference, EXCLUDED.note)`,
          [
            actor.organizationId,
            actor.id,
            b.map((c) => c.welderId),
            b.map((c) => c.shopId),
            b.map((c) => c.process),
            b.map((c) => c.month),
            b.map((c) => c.usedOn),
            b.map((c) => c.job),
            b.map((c) => c.note),
          ],
        );
        done += b.length;
        await tick('writing', done, writes.length);
      }
      // The continuity state of every touched (welder, process), refreshed once, set-based.
      await tick('refreshing continuity', done, writes.length);
      const pairs = [...new Map(writes.map((c) => [`${c.welderId}|${c.process}`, { welderId: c.welderId, process: c.process }])).values()];
      await recordLapseMoves(db, await refreshContinuityPairs(db, pairs), ctx.clock);
      // Like a re-dated entry of the grid: the welds from the earlier of the two days on are checked again
      // (newly flagged ones go to the review queue and the lapse-watch digest).
      await recheckWelds(db, actor, ctx.clock.now(), moved, 'continuity-import');
      return { written: writes.length, pairs: pairs.length };
    },
  };
}

export const continuityImport: KindDef = { fields, plan };
