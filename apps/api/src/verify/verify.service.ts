// The public verify page behind a card's QR code: only the welder's name and stamp, the company, and each
// qualification's state today with a one-line range summary. No photo, no e-mail, no ids.
import type { VerifyView } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { todayIn } from '../lib/dates.js';
import { preparedQuery } from '../lib/prepared.js';
import { companyTimeZone } from '../settings/settings.repository.js';
import { rangeSummary, welderQualificationsToday } from '../qualifications/qualifications.service.js';
import { hashToken, resolveVerifyToken } from './verify-tokens.service.js';

export const verifyNotice = (company: string) =>
  `This page shows what ${company} has on record today. The code edition in force, ${company}'s quality manual and the responsible inspector govern; ask them before relying on it for a particular joint.`;

export const leftNotice = (company: string) =>
  `This welder is no longer with ${company}. ${company} no longer vouches for any qualification on this card; ask the welder's current employer.`;

// A card whose link was revoked or replaced answers 410 Gone; a link that was never issued (mistyped,
// cut short) 404 — the inspector is told which, never "revoked" for a typo (issue 10, item 9).
const noLongerValid = () => new AppError('not_found', 'This card is no longer valid', 410);

async function missingCard(deps: AppDeps, token: string): Promise<AppError> {
  const issued =
    /^[A-Za-z0-9_-]{43}$/.test(token) &&
    (await deps.dataSource.manager.query<unknown[]>(`SELECT 1 FROM verify_tokens WHERE token_hash = $1`, [hashToken(token)]))
      .length > 0;
  return issued ? noLongerValid() : new AppError('not_found', 'No card was found for this link');
}

export async function verifyView(deps: AppDeps, token: string): Promise<VerifyView> {
  const db = deps.dataSource.manager;
  const found = await resolveVerifyToken(db, token, { evenIfLeft: true });
  if (!found) throw await missingCard(deps, token);
  const rows = await preparedQuery<{ name: string; stamp: string; company: string; active: boolean; leftAt: Date | null }>(
    db,
    `SELECT w.name, w.stamp, o.name AS company, w.active, w.left_at AS "leftAt"
       FROM welders w JOIN organizations o ON o.id = w.organization_id
      WHERE w.id = $1`,
    [found.welderId],
  );
  const welder = rows[0];
  if (!welder) throw new AppError('not_found', 'This card is no longer valid');
  const timeZone = await companyTimeZone(db, found.organizationId);
  const asOf = todayIn(timeZone, deps.clock);
  if (!welder.active)
    return {
      welder: { name: welder.name, stamp: welder.stamp },
      company: welder.company,
      asOf,
      leftOn: welder.leftAt ? todayIn(timeZone, welder.leftAt) : asOf,
      qualifications: [],
      notice: leftNotice(welder.company),
    };
  if (!found.live) throw noLongerValid();
  // Read as the company would: the token stands in for a signed-in reader of this one welder.
  const list = await welderQualificationsToday(
    deps,
    { id: '', organizationId: found.organizationId, role: 'qa_manager', welderId: null, shopIds: [] },
    found.welderId,
  );
  return {
    welder: { name: welder.name, stamp: welder.stamp },
    company: welder.company,
    asOf,
    leftOn: null,
    qualifications: list.map(({ row, status }) => ({
      code: row.code as VerifyView['qualifications'][number]['code'],
      process: row.process as VerifyView['qualifications'][number]['process'],
      state: status.state,
      lapsesOn: status.lapsesOn,
      summary: rangeSummary(row.ranges),
    })),
    notice: verifyNotice(welder.company),
  };
}
