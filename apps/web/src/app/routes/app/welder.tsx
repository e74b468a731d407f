// The welder file: identity, stamp, home shop, contact, sign-in; every qualification with its ranges and
// status, every coupon (passed and failed), the attached files; for the QA manager the verify link and
// the record's audit history. A welder sees their own file; a foreman sees the files of their shops' welders.
import type { CouponRecord, Qualification, Upload, Welder } from '@beadroll/rules';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button, ButtonLink, buttonClasses } from '@/components/ui/button';
import { ConfirmDialog, Dialog } from '@/components/ui/dialog';
import { ChevronLeftIcon, PlusIcon } from '@/components/ui/icons';
import { Card, PageHeader } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { ContinuitySummary } from '@/features/continuity/components/continuity-timeline';
import { formatBytes } from '@/components/ui/upload-input';
import { auditQueries } from '@/features/audit/api/audit-queries';
import { couponQueries } from '@/features/coupons/api/coupon-queries';
import { CouponsTable } from '@/features/coupons/components/coupons-table';
import { qualificationQueries, walletCardUrl } from '@/features/qualifications/api/qualification-queries';
import { QualificationCard } from '@/features/qualifications/components/qualification-card';
import { RevokeDialog } from '@/features/qualifications/components/revoke-dialog';
import { VerifyLinkPanel } from '@/features/verify/components/verify-link-panel';
import { uploadContentUrl } from '@/lib/uploads';
import { AuditTable } from '@/features/audit/components/audit-table';
import { peopleQueries } from '@/features/people/api/people-queries';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { useCreateWelderAccount } from '@/features/welders/api/create-welder-account';
import { useUpdateWelder } from '@/features/welders/api/update-welder';
import { welderQueries } from '@/features/welders/api/welder-queries';
import { WELDER_CONFLICT_MESSAGE, WelderForm } from '@/features/welders/components/welder-form';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { formatInstantDay } from '@beadroll/rules';

function Detail({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[8rem_minmax(0,1fr)] gap-2 py-2 sm:grid-cols-[10rem_minmax(0,1fr)]">
      <dt className="text-sm font-semibold text-stone-600">{label}</dt>
      <dd className="text-stone-900">{children}</dd>
    </div>
  );
}

function WelderHistory({ welderId }: { welderId: string }) {
  const history = useQuery(auditQueries.list({ entityType: 'welder', entityId: welderId }));
  const shops = useQuery(shopQueries.list());
  return (
    <section className="mt-6" aria-labelledby="history-heading">
      <h2 id="history-heading" className="mb-2 text-lg font-bold">
        History of this record
      </h2>
      {history.isPending ? (
        <LoadingState label="Loading history…" />
      ) : history.isError ? (
        <ErrorState error={history.error} onRetry={() => void history.refetch()} />
      ) : (
        <AuditTable events={history.data.items} showRecord={false} shops={shops.data} />
      )}
    </section>
  );
}

function WelderQualifications({ welderId, isQa }: { welderId: string; isQa: boolean }) {
  const list = useQuery(qualificationQueries.list({ welderId, state: 'all' }));
  const [revoking, setRevoking] = useState<Qualification | null>(null);
  const items = list.data?.items ?? [];
  const current = items.filter((q) => !q.supersededById);
  const superseded = items.filter((q) => q.supersededById);
  return (
    <section className="mt-6" aria-labelledby="qualifications-heading">
      <h2 id="qualifications-heading" className="mb-2 text-lg font-bold">
        Qualifications
      </h2>
      {list.isPending ? (
        <LoadingState label="Loading qualifications…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : items.length === 0 ? (
        <p className="rounded-lg border border-dashed border-stone-300 bg-white px-4 py-6 text-sm text-stone-600">
          No certified qualification yet. A passing coupon becomes a qualification when the QA manager certifies it.
        </p>
      ) : (
        <div className="space-y-3">
          {[...current, ...superseded].map((q) => (
            <QualificationCard
              key={q.id}
              qualification={q}
              showSources={isQa}
              actions={
                isQa &&
                q.status.state !== 'revoked' &&
                !q.supersededById && (
                  <Button variant="ghost" onClick={() => setRevoking(q)}>
                    Revoke
                  </Button>
                )
              }
            />
          ))}
        </div>
      )}
      {revoking && <RevokeDialog qualification={revoking} onClose={() => setRevoking(null)} />}
    </section>
  );
}

function uploadsOf(coupons: CouponRecord[]): Array<{ upload: Upload; what: string; couponId: string }> {
  return coupons.flatMap((c) => [
    ...(c.examination.volumetric?.report
      ? [{ upload: c.examination.volumetric.report, what: `Examination report, coupon of ${c.testedOn}`, couponId: c.id }]
      : []),
    ...(c.examination.bend?.specimens ?? []).flatMap((s, i) =>
      s.photo ? [{ upload: s.photo, what: `Photo of ${s.label ?? `specimen ${i + 1}`}, coupon of ${c.testedOn}`, couponId: c.id }] : [],
    ),
  ]);
}

function WelderCoupons({ welder, isQa }: { welder: Welder; isQa: boolean }) {
  const list = useQuery(couponQueries.list({ welderId: welder.id }));
  const files = list.data ? uploadsOf(list.data.items) : [];
  return (
    <>
      <section className="mt-6" aria-labelledby="coupons-heading">
        <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
          <h2 id="coupons-heading" className="text-lg font-bold">
            Coupons
          </h2>
          {isQa && (
            <ButtonLink variant="primary" to={paths.couponNew.href({ welderId: welder.id })}>
              <PlusIcon /> Record a coupon for {welder.stamp}
            </ButtonLink>
          )}
        </div>
        {list.isPending ? (
          <LoadingState label="Loading coupons…" />
        ) : list.isError ? (
          <ErrorState error={list.error} onRetry={() => void list.refetch()} />
        ) : (
          <CouponsTable coupons={list.data.items} showWelder={false} empty="No qualification test recorded for this welder yet." />
        )}
      </section>
      {files.length > 0 && (
        <section className="mt-6" aria-labelledby="uploads-heading">
          <h2 id="uploads-heading" className="mb-2 text-lg font-bold">
            Attached files
          </h2>
          <ul className="divide-y divide-stone-100 rounded-lg border border-stone-200 bg-white text-sm">
            {files.map(({ upload, what }) => (
              <li key={upload.id} className="flex flex-wrap items-center gap-3 px-3 py-2">
                <a className="font-semibold text-accent-700 underline" href={uploadContentUrl(upload.id)} download={upload.fileName}>
                  {upload.fileName}
                </a>
                <span className="text-stone-700">{what}</span>
                <span className="text-xs text-stone-500">{formatBytes(upload.size)}</span>
              </li>
            ))}
          </ul>
        </section>
      )}
    </>
  );
}

function QaActions({ welder }: { welder: Welder }) {
  const queryClient = useQueryClient();
  const shops = useQuery(shopQueries.list());
  const giveSignIn = useCreateWelderAccount();
  const update = useUpdateWelder({ successMessage: welder.active ? `${welder.stamp} marked as left` : `${welder.stamp} is active again` });
  const [dialog, setDialog] = useState<'edit' | 'sign-in' | 'active' | null>(null);
  const close = () => {
    setDialog(null);
    giveSignIn.reset();
    update.reset();
  };
  // A saved change adds to the record's history shown below.
  const saved = () => {
    close();
    void queryClient.invalidateQueries({ queryKey: auditQueries.all() });
  };
  const activeError =
    update.error instanceof ApiError && update.error.status === 409 ? WELDER_CONFLICT_MESSAGE : update.error ? errorMessage(update.error) : undefined;
  const signInError =
    giveSignIn.error instanceof ApiError ? (giveSignIn.error.fields.email ?? giveSignIn.error.message) : giveSignIn.error ? errorMessage(giveSignIn.error) : undefined;

  return (
    <>
      <Button variant="primary" onClick={() => setDialog('edit')} disabled={!shops.data}>
        Edit
      </Button>
      {!welder.hasAccount && welder.active && (
        <Button onClick={() => setDialog('sign-in')} disabled={!welder.email} title={welder.email ? undefined : 'Add a contact e-mail first'}>
          Give sign-in
        </Button>
      )}
      <Button variant="secondary" onClick={() => setDialog('active')}>
        {welder.active ? 'Mark as left' : 'Mark as active'}
      </Button>

      <Dialog open={dialog === 'edit'} onClose={close} title={`Edit ${welder.stamp} · ${welder.name}`} size="lg">
        {dialog === 'edit' && shops.data && (
          <WelderForm welder={welder} shops={shops.data.filter((s) => s.active)} onCancel={close} onDone={saved} />
        )}
      </Dialog>

      <ConfirmDialog
        open={dialog === 'sign-in'}
        title={`Give ${welder.name} a sign-in?`}
        confirmLabel="Create sign-in and send invitation"
        tone="primary"
        busy={giveSignIn.isPending}
        error={signInError}
        onCancel={close}
        onConfirm={() =>
          giveSignIn.mutate(welder.id, {
            onSuccess: () => {
              saved();
              void queryClient.invalidateQueries({ queryKey: peopleQueries.all() });
            },
          })
        }
      >
        Beadroll creates a welder sign-in for <strong>{welder.email}</strong> and e-mails an invitation to choose a password.
        The welder will see their own record only.
      </ConfirmDialog>

      <ConfirmDialog
        open={dialog === 'active'}
        title={welder.active ? `Mark ${welder.stamp} as left the company?` : `Mark ${welder.stamp} as active again?`}
        confirmLabel={welder.active ? 'Mark as left' : 'Mark as active'}
        tone={welder.active ? 'danger' : 'primary'}
        busy={update.isPending}
        error={activeError}
        onCancel={close}
        onConfirm={() => update.mutate({ id: welder.id, input: { active: !welder.active, version: welder.version } }, { onSuccess: saved })}
      >
        {welder.active
          ? `${welder.name} leaves the active list. The record and its history are kept and the stamp stays taken.`
          : `${welder.name} returns to the active list of ${welder.homeShop.name}.`}
      </ConfirmDialog>
    </>
  );
}

export default function WelderRoute() {
  const { id = '' } = useParams();
  const me = useUser();
  const welder = useQuery(welderQueries.detail(id));
  const isQa = me.role === 'qa_manager';
  const own = me.welderId === id;
  // a wallet card vouches for today: none is issued when no qualification is current or lapsing
  const held = useQuery(qualificationQueries.list({ welderId: id, state: 'all' }));
  const carded = (held.data?.items ?? []).some((q) => !q.supersededById && (q.status.state === 'current' || q.status.state === 'lapsing'));

  const back =
    me.role !== 'welder' ? (
      <Link to={paths.welders.href()} className="mb-2 inline-flex min-h-11 items-center gap-1 text-sm font-semibold text-accent-700 hover:underline sm:min-h-0">
        <ChevronLeftIcon /> Welders
      </Link>
    ) : null;

  if (welder.isPending) return <>{back}<LoadingState label="Loading the welder file…" /></>;
  if (welder.isError) {
    return (
      <>
        {back}
        <PageHeader title="Welder file" />
        <ErrorState error={welder.error} onRetry={() => void welder.refetch()} />
      </>
    );
  }
  const w = welder.data;

  return (
    <>
      {back}
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            <span className="tabular-nums">{w.stamp}</span>
            <span>{w.name}</span>
            <StatusChip status={w.active ? 'welder.active' : 'welder.left'} />
          </span>
        }
        description={own ? 'Your welder file.' : 'Welder file'}
        actions={isQa ? <QaActions welder={w} /> : undefined}
      />
      <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Card className="px-4 py-2">
          <h2 className="sr-only">Identity</h2>
          <dl className="divide-y divide-stone-100">
            <Detail label="Stamp">
              <span className="tabular-nums font-semibold">{w.stamp}</span>
            </Detail>
            <Detail label="Name">{w.name}</Detail>
            <Detail label="Home shop">
              <span className="tabular-nums text-xs text-stone-500">{w.homeShop.code}</span>{' '}
              {w.homeShop.name}
            </Detail>
            <Detail label="E-mail">{w.email || <span className="text-stone-500">No contact e-mail</span>}</Detail>
            <Detail label="Sign-in">
              {w.hasAccount ? (
                <StatusChip status="person.active" label="Has a sign-in" />
              ) : (
                <span className="text-stone-600">No sign-in{isQa && !w.email ? ' (add a contact e-mail to give one)' : ''}</span>
              )}
            </Detail>
            <Detail label="In Beadroll since">{formatInstantDay(w.createdAt, me.timeZone, 'long')}</Detail>
          </dl>
        </Card>
        <Card className="p-4">
          <h2 className="font-bold">Wallet card and verify link</h2>
          <p className="mt-1 text-sm text-stone-700">
            The wallet card lists the current and lapsing qualifications, with a QR code that opens the public Verify page.
          </p>
          {carded ? (
            <a className={buttonClasses('secondary', 'mt-2')} href={walletCardUrl(w.id)} download>
              Download the wallet card (PDF)
            </a>
          ) : held.data ? (
            <p className="mt-2 text-sm text-stone-700">No wallet card is issued: no qualification of this welder is current.</p>
          ) : null}
          {isQa && (
            <div className="mt-4 border-t border-stone-100 pt-3">
              <h3 className="text-sm font-bold">Verify link</h3>
              <VerifyLinkPanel welderId={w.id} welderName={w.name} />
            </div>
          )}
        </Card>
      </div>
      <WelderQualifications welderId={w.id} isQa={isQa} />
      <section className="mt-6" aria-labelledby="continuity-heading">
        <h2 id="continuity-heading" className="mb-2 text-lg font-bold">
          Continuity timeline
        </h2>
        <ContinuitySummary welderId={w.id} full />
      </section>
      <WelderCoupons welder={w} isQa={isQa} />
      {isQa && <WelderHistory welderId={w.id} />}
    </>
  );
}
