// People (sign-ins) of a company: the QA manager invites foremen, welders and other QA managers by
// e-mail, assigns foremen to shops and deactivates accounts. Every change is audited; an invitation's
// e-mail goes through the link-mail outbox (auth/link-mail.ts) after the response, never inside it.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { Person, personInput, PersonUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import { enqueueLinkMail } from '../auth/link-mail.js';
import { companyShops } from '../shops/shops.service.js';
import * as repo from './people.repository.js';

type PersonInput = z.output<typeof personInput>;

// Only the company's own people are checked: whether an address signs in for another company is never
// told to an inviter (issue 11, finding 7). Such an invitation is saved and queued like any other; the
// address's owner is refused when using the link (auth.service setPassword), so that account is untouched.
const emailTaken = (email: string) =>
  AppError.validation({ email: `${email} is already a person of your company` });

export async function listPeople(deps: AppDeps, actor: Actor): Promise<{ items: Person[] }> {
  return { items: await repo.listPeople(deps.dataSource.manager, actor) };
}

export async function getPerson(
  deps: AppDeps,
  actor: Actor,
  id: string,
  db: EntityManager = deps.dataSource.manager,
): Promise<Person> {
  const person = isUuid(id) ? await repo.findPerson(db, actor, id) : null;
  if (!person) throw AppError.notFound('person');
  return person;
}

/** The given shop ids, checked to be shops of the actor's company (field `shopIds` otherwise). */
async function checkShops(db: EntityManager, actor: Actor, shopIds: string[]): Promise<string[]> {
  const unique = [...new Set(shopIds)];
  const found = await companyShops(db, actor, unique);
  if (found.length !== unique.length) throw AppError.validation({ shopIds: 'Choose shops of your company' });
  return unique;
}

export async function invitePerson(deps: AppDeps, actor: Actor, input: PersonInput): Promise<Person> {
  const id = await deps.dataSource
    .transaction(async (db) => {
      if (await repo.emailIsPerson(db, actor.organizationId, input.email)) throw emailTaken(input.email);
      const shopIds = input.role === 'foreman' ? await checkShops(db, actor, input.shopIds) : [];
      let welderId: string | null = null;
      if (input.role === 'welder' && input.welderId) {
        const welder = await repo.findWelderForAccount(db, actor.organizationId, input.welderId);
        if (!welder) throw AppError.validation({ welderId: 'Choose a welder of your company' });
        if (welder.hasAccount) throw AppError.validation({ welderId: 'This welder already has a sign-in' });
        welderId = welder.id;
      }
      const now = deps.clock.now();
      const userId = await repo.insertUser(db, {
        organizationId: actor.organizationId,
        email: input.email,
        name: input.name,
        role: input.role,
        welderId,
        invitedAt: now,
      });
      await repo.setForemanShops(db, userId, shopIds);
      await recordAudit(db, actor, now, {
        action: 'person.invited',
        entityType: 'person',
        entityId: userId,
        before: null,
        after: { email: input.email, name: input.name, role: input.role, shopIds, welderId },
      });
      await enqueueLinkMail(db, { organizationId: actor.organizationId, userId, purpose: 'invitation', at: now });
      return userId;
    })
    .catch((err: unknown) => {
      if (isUniqueViolation(err, 'users_org_email_key')) throw emailTaken(input.email);
      if (isUniqueViolation(err, 'users_welder_key'))
        throw AppError.validation({ welderId: 'This welder already has a sign-in' });
      throw err;
    });
  return getPerson(deps, actor, id);
}

export async function updatePerson(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: PersonUpdateInput,
): Promise<Person> {
  if (!isUuid(id)) throw AppError.notFound('person');
  await deps.dataSource.transaction(async (db) => {
    const current = await repo.lockPerson(db, actor.organizationId, id);
    if (!current) throw AppError.notFound('person');
    if (input.active === false && current.id === actor.id)
      throw AppError.validation({ active: 'You cannot deactivate your own account' });
    let shopIds = current.shopIds;
    if (input.shopIds !== undefined) {
      if (current.role !== 'foreman')
        throw AppError.validation({ shopIds: 'Only a foreman is assigned to shops' });
      if (input.shopIds.length === 0)
        throw AppError.validation({ shopIds: 'Assign the foreman to at least one shop' });
      shopIds = (await checkShops(db, actor, input.shopIds)).sort();
    }
    const before = { name: current.name, active: current.active, shopIds: current.shopIds };
    const after = { name: input.name ?? current.name, active: input.active ?? current.active, shopIds };
    const changes = diff(before, after);
    if (changes.changed.length === 0) return;
    const now = deps.clock.now();
    await repo.updateUser(db, id, { name: after.name, active: after.active });
    if (changes.changed.includes('shopIds')) await repo.setForemanShops(db, id, shopIds);
    let action = 'person.updated';
    if (changes.changed.includes('active'))
      action = after.active ? 'person.reactivated' : 'person.deactivated';
    await recordAudit(db, actor, now, {
      action,
      entityType: 'person',
      entityId: id,
      before: changes.before,
      after: changes.after,
    });
  });
  return getPerson(deps, actor, id);
}

/** Sends a fresh invitation link (voiding the old one) while the person has not chosen a password. */
export async function resendInvitation(deps: AppDeps, actor: Actor, id: string): Promise<void> {
  if (!isUuid(id)) throw AppError.notFound('person');
  await deps.dataSource.transaction(async (db) => {
    const current = await repo.lockPerson(db, actor.organizationId, id);
    if (!current) throw AppError.notFound('person');
    if (!current.active) throw AppError.conflict('This account is deactivated; reactivate it first');
    if (current.hasPassword) throw AppError.conflict('This person has already chosen a password');
    const now = deps.clock.now();
    await repo.updateUser(db, id, { invitedAt: now });
    await recordAudit(db, actor, now, {
      action: 'person.reinvited',
      entityType: 'person',
      entityId: id,
      before: null,
      after: null,
    });
    await enqueueLinkMail(db, { organizationId: actor.organizationId, userId: id, purpose: 'invitation', at: now });
  });
}

/** Creates the welder sign-in of a welder record, for the e-mail on that record, and invites it. */
export async function createWelderAccount(deps: AppDeps, actor: Actor, welderId: string): Promise<Person> {
  const welder = isUuid(welderId)
    ? await repo.findWelderForAccount(deps.dataSource.manager, actor.organizationId, welderId)
    : null;
  if (!welder) throw AppError.notFound('welder');
  if (!welder.email) throw AppError.validation({ email: 'This welder has no e-mail address; add one first' });
  if (welder.hasAccount) throw AppError.validation({ email: 'This welder already has a sign-in' });
  return invitePerson(deps, actor, {
    email: welder.email,
    name: welder.name,
    role: 'welder',
    welderId: welder.id,
    shopIds: [],
  });
}
