// Qualifications imported from paper WPQs whose stated ranges differ from those the rules compute: the list
// the QA manager works through, and settling one — the computed ranges stand, or the qualification is
// narrowed to what both the rules and the paper allow (never wider than the rules). Audited.
import { narrowToPaper, type PaperRecord, type PaperSettleInput, type QualifiedRanges, type StatedRanges } from '@beadroll/rules';
import type { z } from 'zod';
import type { paperRecordListQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { recordAudit } from '../lib/audit.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { userName } from '../qualifications/qualifications.repository.js';

type Raw = Omit<PaperRecord, 'welder'> & { welderId: string; stamp: string; name: string };

const SELECT = `
  SELECT p.qualification_id AS "qualificationId", q.number, q.welder_id AS "welderId", w.stamp, w.name, q.code, q.process,
         to_char(c.tested_on, 'YYYY-MM-DD') AS "testedOn", p.import_id AS "importId", p.line, p.differences,
         p.settlement, p.settlement_note AS "settlementNote", u.name AS "settledBy",
         to_char(p.settled_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "settledAt"
    FROM qualification_paper_records p
    JOIN qualifications q ON q.id = p.qualification_id
    JOIN coupons c ON c.id = q.coupon_id
    JOIN welders w ON w.id = q.welder_id
    LEFT JOIN users u ON u.id = p.settled_by
   WHERE p.organization_id = $1 AND p.differences <> '[]'::jsonb`;

const view = ({ welderId, stamp, name, ...r }: Raw): PaperRecord => ({ ...r, welder: { id: welderId, stamp, name } });

export async function listPaperRecords(deps: AppDeps, actor: Actor, q: z.output<typeof paperRecordListQuery>) {
  const filter = q.state === 'open' ? ' AND p.settled_at IS NULL' : q.state === 'settled' ? ' AND p.settled_at IS NOT NULL' : '';
  const rows = await deps.dataSource.manager.query<Raw[]>(`${SELECT}${filter} ORDER BY w.stamp, c.tested_on LIMIT 1000`, [actor.organizationId]);
  return { items: rows.map(view) };
}

export async function settlePaperRecord(deps: AppDeps, actor: Actor, id: string, input: PaperSettleInput): Promise<PaperRecord> {
  if (!isUuid(id)) throw AppError.notFound('qualification');
  await deps.dataSource.transaction(async (db) => {
    const [p] = await db.query<{ stated: StatedRanges; computed: QualifiedRanges; ranges: QualifiedRanges; settled: boolean; differences: unknown[] }[]>(
      `SELECT p.stated, p.computed_ranges AS computed, q.ranges, p.settled_at IS NOT NULL AS settled, p.differences
         FROM qualification_paper_records p JOIN qualifications q ON q.id = p.qualification_id
        WHERE p.organization_id = $1 AND p.qualification_id = $2
          FOR UPDATE OF p, q`,
      [actor.organizationId, id],
    );
    if (!p || p.differences.length === 0) throw AppError.notFound('qualification');
    if (p.settled) throw AppError.conflict('This difference is already settled');
    const now = deps.clock.now();
    const by = await userName(db, actor.id);
    const ranges = input.settlement === 'narrowed' ? narrowToPaper(p.computed, p.stated, by) : p.computed;
    await db.query(
      `UPDATE qualification_paper_records SET settlement = $2, settlement_note = $3, settled_by = $4, settled_at = $5 WHERE qualification_id = $1`,
      [id, input.settlement, input.note, actor.id, now],
    );
    if (JSON.stringify(ranges) !== JSON.stringify(p.ranges))
      await db.query(`UPDATE qualifications SET ranges = $2, version = version + 1, updated_at = $3 WHERE id = $1`, [id, JSON.stringify(ranges), now]);
    await recordAudit(db, actor, now, {
      action: 'qualification.paper-ranges-settled',
      entityType: 'qualification',
      entityId: id,
      before: { settlement: null, ranges: p.ranges },
      after: { settlement: input.settlement, note: input.note, stated: p.stated, ranges },
    });
  });
  const [row] = await deps.dataSource.manager.query<Raw[]>(`${SELECT} AND p.qualification_id = $2`, [actor.organizationId, id]);
  return view(row!);
}
