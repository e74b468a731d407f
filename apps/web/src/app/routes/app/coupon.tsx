// One coupon as recorded: the test, the coupon, the examination with each specimen's verdict and photo,
// the server's stored verdict with its reasons, criteria and rules version. A passing coupon can be
// certified into a qualification; a failed one offers a retest.
import { formatLengthBoth, type CouponRecord } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import { z } from 'zod';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog, DialogActions } from '@/components/ui/dialog';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { ChevronLeftIcon } from '@/components/ui/icons';
import { Card, PageHeader } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { useCertifyCoupon } from '@/features/coupons/api/certify-coupon';
import { couponQueries } from '@/features/coupons/api/coupon-queries';
import { ExaminationDetails } from '@/features/coupons/components/examination-details';
import { RETEST_BASIS_WORDS } from '@/features/coupons/model/examination-words';
import { codeNames } from '@/lib/codes';
import { qualificationQueries } from '@/features/qualifications/api/qualification-queries';
import { ApiError } from '@/lib/api-client';
import { applyApiError, FORM_ERROR } from '@/lib/form-errors';
import { useUser } from '@/lib/auth';

function Detail({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[10rem_minmax(0,1fr)] gap-2 py-1.5">
      <dt className="text-sm font-semibold text-stone-600">{label}</dt>
      <dd className="text-stone-900">{children}</dd>
    </div>
  );
}

const STORED_CAUTION =
  'Evaluated by Beadroll when the coupon was saved, with the criteria set and rules version shown; the code edition in force, the company’s quality manual and the responsible inspector govern.';

const todayIso = () => new Date().toISOString().slice(0, 10);
const certifyForm = z.object({
  certifiedOn: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter the date of certification'),
  supersedesId: z.string(),
});

function CertifyDialog({ coupon, open, onClose }: { coupon: CouponRecord; open: boolean; onClose: () => void }) {
  const queryClient = useQueryClient();
  const me = useUser();
  const certify = useCertifyCoupon();
  // A qualification of the same welder, code and process that this one corrects leaves the current lists.
  const earlier = useQuery(qualificationQueries.list({ welderId: coupon.welder.id }));
  // a combination coupon (QW-306) certifies every process it was welded with
  const processes = [...new Set([coupon.coupon.process, ...(coupon.examination.layers ?? []).map((l) => l.process)])];
  const correctable = (earlier.data?.items ?? []).filter((q) => q.code === coupon.coupon.code && processes.includes(q.process) && !q.supersededById);
  const form = useForm<z.input<typeof certifyForm>>({ resolver: zodResolver(certifyForm), defaultValues: { certifiedOn: todayIso(), supersedesId: '' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(({ certifiedOn, supersedesId }) =>
    certify.mutate(
      { id: coupon.id, input: { certifiedOn, version: coupon.version, ...(supersedesId ? { supersedesId } : {}) } },
      {
        onSuccess: () => {
          onClose();
          void queryClient.invalidateQueries({ queryKey: qualificationQueries.all() });
        },
        onError: (error) => {
          if (error instanceof ApiError && error.status === 409) form.setError(FORM_ERROR, { type: 'server', message: error.message });
          else applyApiError(error, form.setError, ['certifiedOn', 'supersedesId']);
        },
      },
    ),
  );
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={`Certify ${coupon.welder.stamp}'s ${codeNames[coupon.coupon.code]} ${processes.join(' and ')} qualification${processes.length > 1 ? 's' : ''}?`}
      description={`You certify, as ${me.name}, that ${coupon.welder.name} passed this test on ${coupon.testedOn}. ${processes.length > 1 ? `A combination coupon qualifies each process with the weld metal it deposited (QW-306): one qualification record (WPQ) is issued per process, each with its own ranges` : 'The qualification record (WPQ) is issued with the ranges Beadroll computed'}; it is never deleted, only superseded or revoked.`}
    >
      <form onSubmit={(e) => void submit(e)} noValidate>
        <TextField label="Certified on" type="date" max={todayIso()} min={coupon.testedOn} error={errors.certifiedOn?.message} {...form.register('certifiedOn')} />
        {correctable.length > 0 && (
          <SelectField
            label="Corrects an earlier qualification"
            wrapperClassName="mt-3"
            hint="Only when this record replaces one issued in error; the earlier one is kept as superseded."
            error={errors.supersedesId?.message}
            {...form.register('supersedesId')}
          >
            <option value="">No, this is a qualification of its own</option>
            {correctable.map((q) => (
              <option key={q.id} value={q.id}>
                Supersede the {q.process} one certified on {q.certifiedOn} ({q.status.state})
              </option>
            ))}
          </SelectField>
        )}
        <div className="mt-3">
          <FormError message={errors.root?.server?.message} />
        </div>
        <DialogActions>
          <Button onClick={onClose} disabled={certify.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" busy={certify.isPending}>
            Certify qualification
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}

export default function CouponRoute() {
  const { id = '' } = useParams();
  const me = useUser();
  const coupon = useQuery(couponQueries.detail(id));
  const [certifying, setCertifying] = useState(false);
  const backTo = (to: string, label: string) => (
    <Link to={to} className="mb-2 inline-flex min-h-11 items-center gap-1 text-sm font-semibold text-accent-700 hover:underline sm:min-h-0">
      <ChevronLeftIcon /> {label}
    </Link>
  );
  const welderId = coupon.data?.welder.id ?? me.welderId;
  const back =
    me.role === 'qa_manager'
      ? backTo(paths.coupons.href(), 'Coupons')
      : welderId
        ? backTo(paths.welder.href(welderId), 'Welder file')
        : backTo(paths.welders.href(), 'Welders');
  if (coupon.isPending) return <>{back}<LoadingState label="Loading the coupon…" /></>;
  if (coupon.isError)
    return (
      <>
        {back}
        <PageHeader title="Coupon" />
        <ErrorState error={coupon.error} onRetry={() => void coupon.refetch()} />
      </>
    );
  const c = coupon.data;
  const isQa = me.role === 'qa_manager';
  // a retest qualifies only as a whole (an immediate retest of two coupons, both passing), and once
  const set = c.retestSet;
  const setCertified = set?.coupons.some((x) => x.id !== c.id && x.qualificationId) ?? false;
  const canCertify = isQa && c.result === 'accept' && !c.qualificationId && (!set || set.verdict.result === 'accept') && !setCertified;
  const retestHref = paths.couponNew.href({ retestOf: c.id });

  return (
    <>
      {back}
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            <span>
              Coupon of {c.testedOn} · <span className="tabular-nums">{c.welder.stamp}</span>
            </span>
            <StatusChip status={`coupon.${c.result}`} />
          </span>
        }
        description={`${c.welder.name} · ${codeNames[c.coupon.code]} · ${c.coupon.process} · ${c.coupon.position} ${c.coupon.form}`}
        actions={
          <>
            <ButtonLink to={paths.welder.href(c.welder.id)}>Welder file</ButtonLink>
            {canCertify && (
              <Button variant="primary" onClick={() => setCertifying(true)}>
                Certify
              </Button>
            )}
            {isQa && c.result === 'reject' && (
              <ButtonLink variant="primary" to={retestHref}>
                Record a retest
              </ButtonLink>
            )}
          </>
        }
      />
      <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-4">
          <Card className="px-4 py-3">
            <h2 className="font-bold">The test</h2>
            <dl className="mt-1 divide-y divide-stone-100">
              <Detail label="Welder">
                <Link className="font-semibold text-accent-700 hover:underline" to={paths.welder.href(c.welder.id)}>
                  {c.welder.stamp} · {c.welder.name}
                </Link>
              </Detail>
              <Detail label="Shop">{c.shop.code} · {c.shop.name}</Detail>
              <Detail label="WPS">{c.procedure.number} rev {c.procedure.revision}</Detail>
              <Detail label="Code">{codeNames[c.coupon.code]}</Detail>
              <Detail label="Process">
                {c.coupon.process}
                {c.coupon.transferMode ? ` (${c.coupon.transferMode} transfer)` : ''}
              </Detail>
              <Detail label="Coupon">
                {c.coupon.form}, {c.coupon.weld} weld, {c.coupon.position}
                {c.pipe ? `, NPS ${c.pipe.nps} Sch ${c.pipe.schedule}` : ''}
              </Detail>
              <Detail label={c.coupon.form === 'pipe' ? 'Wall' : 'Thickness'}>{formatLengthBoth(c.coupon.thickness)}</Detail>
              {c.coupon.outsideDiameter && <Detail label="Outside diameter">{formatLengthBoth(c.coupon.outsideDiameter)}</Detail>}
              {c.coupon.depositedThickness && <Detail label="Deposited">{formatLengthBoth(c.coupon.depositedThickness)}{c.coupon.layers ? `, ${c.coupon.layers} layers` : ''}</Detail>}
              <Detail label="Backing">{c.coupon.backing ? 'With backing' : 'Without backing'}</Detail>
              <Detail label="F-No.">{c.coupon.fNumber ?? 'No filler'}</Detail>
              <Detail label="Progression">{c.coupon.progression ?? '—'}</Detail>
              <Detail label="P-Nos.">{c.pNumbers.join(', ') || '—'}</Detail>
              <Detail label="Examiner">
                {c.examiner.name}
                {c.examiner.certificateNumber ? ` (cert. ${c.examiner.certificateNumber})` : ''}
              </Detail>
              <Detail label="Lab report">{c.labReportNumber || '—'}</Detail>
              <Detail label="Visual">
                <StatusChip status={`coupon.${c.visual}`} />
              </Detail>
              <Detail label="Recorded by">{c.recordedBy?.name ?? '—'}</Detail>
              {c.notes && <Detail label="Notes">{c.notes}</Detail>}
            </dl>
          </Card>
          <Card className="p-4">
            <h2 className="mb-2 font-bold">Examination</h2>
            <ExaminationDetails coupon={c} />
          </Card>
        </div>
        <div className="space-y-4">
          <Card className="p-4">
            <section aria-label="Stored verdict">
              <h2 className="font-bold">Verdict stored by Beadroll</h2>
              <div className="mt-2 text-lg">
                <StatusChip status={`coupon.${c.result}`} />
              </div>
              {c.reasons.length > 0 ? (
                <ul className="mt-2 space-y-1 text-sm">
                  {c.reasons.map((r, i) => (
                    <li key={i} className="rounded-md bg-red-50 px-3 py-2 text-red-900">
                      {r.message} <span className="rounded bg-white/70 px-1 text-xs font-semibold">{r.clause}</span>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="mt-2 text-sm text-stone-700">Every part of the examination met the criteria.</p>
              )}
              <p className="mt-2 text-xs text-stone-600">
                Judged by {c.evaluation ? `${c.evaluation.codeCriteria.name} (${c.evaluation.codeCriteria.clause})` : `${codeNames[c.coupon.code]} criteria`}
                {c.evaluation?.additionalCriteria ? `, and in addition ${c.evaluation.additionalCriteria.name}` : ''} · rules version {c.rulesVersion}
              </p>
              <p className="mt-1 text-xs text-stone-500">{STORED_CAUTION}</p>
            </section>
          </Card>
          {set && (
            <Card className="p-4">
              <section aria-label="Retest">
                <h2 className="font-bold">Retest</h2>
                <p className="mt-1 text-sm">
                  {RETEST_BASIS_WORDS[set.verdict.basis]} of the{' '}
                  <Link className="font-semibold text-accent-700 underline" to={paths.coupon.href(c.retestOfId ?? '')}>
                    failed coupon{c.examination.retest?.failedOn ? ` of ${c.examination.retest.failedOn}` : ''}
                  </Link>
                  .
                </p>
                <p className="mt-2 text-sm" data-retest={set.verdict.result}>
                  <span className="font-semibold">
                    The retest as a whole: {set.verdict.result === 'accept' ? 'passed' : set.verdict.result === 'reject' ? 'failed' : `waiting (${set.verdict.recorded} of ${set.verdict.needed} coupons)`}.
                  </span>{' '}
                  {set.verdict.message} <span className="whitespace-nowrap rounded bg-stone-100 px-1 text-xs font-semibold">{set.verdict.clause}</span>
                </p>
                {set.coupons.length > 1 && (
                  <ul className="mt-2 space-y-1 text-sm">
                    {set.coupons.map((x) => (
                      <li key={x.id} className="flex items-center gap-2">
                        {x.id === c.id ? <span className="tabular-nums">{x.testedOn} (this coupon)</span> : <Link className="tabular-nums font-semibold text-accent-700 underline" to={paths.coupon.href(x.id)}>{x.testedOn}</Link>}
                        <StatusChip status={`coupon.${x.result}`} />
                      </li>
                    ))}
                  </ul>
                )}
                {set.verdict.result === 'awaiting' && isQa && (
                  <p className="mt-2 text-sm">
                    <Link className="font-semibold text-accent-700 underline" to={paths.couponNew.href({ retestOf: c.retestOfId ?? '' })}>
                      Record the next coupon of this retest
                    </Link>
                  </p>
                )}
              </section>
            </Card>
          )}
          {c.retests.length > 0 && (
            <Card className="p-4">
              <section aria-label="Retests of this coupon">
                <h2 className="font-bold">Retests of this coupon</h2>
                <ul className="mt-2 space-y-1 text-sm">
                  {c.retests.map((r) => (
                    <li key={r.id} className="flex items-center gap-2">
                      <Link className="tabular-nums font-semibold text-accent-700 underline" to={paths.coupon.href(r.id)}>
                        {r.testedOn}
                      </Link>
                      <span>{RETEST_BASIS_WORDS[r.basis]}</span>
                      <StatusChip status={`coupon.${r.result}`} />
                    </li>
                  ))}
                </ul>
              </section>
            </Card>
          )}
          <Card className="p-4">
            <h2 className="font-bold">Qualification</h2>
            {c.qualificationId ? (
              <p className="mt-1 text-sm">
                Certified.{' '}
                <Link className="font-semibold text-accent-700 underline" to={paths.welder.href(c.welder.id)}>
                  See it in the welder file
                </Link>
                .
              </p>
            ) : c.result === 'accept' && set && set.verdict.result !== 'accept' ? (
              <p className="mt-1 text-sm text-stone-700">This coupon passed, but the retest it belongs to has not passed as a whole: it cannot be certified yet.</p>
            ) : c.result === 'accept' && setCertified ? (
              <p className="mt-1 text-sm text-stone-700">This retest is already certified from its other coupon.</p>
            ) : c.result === 'accept' ? (
              <p className="mt-1 text-sm text-stone-700">Passed and not yet certified.{isQa ? ' Certify it to issue the qualification record.' : ''}</p>
            ) : (
              <p className="mt-1 text-sm text-stone-700">
                {c.result === 'reject' ? 'This coupon did not pass; it stays on the welder file with its reasons.' : 'A specimen is to be replaced: the coupon has no final verdict until the replacement specimen from the same coupon is judged.'}
                {isQa && c.result === 'reject' && (
                  <>
                    {' '}
                    <Link className="font-semibold text-accent-700 underline" to={retestHref}>
                      Record a retest
                    </Link>
                    .
                  </>
                )}
              </p>
            )}
          </Card>
        </div>
      </div>
      {canCertify && <CertifyDialog coupon={c} open={certifying} onClose={() => setCertifying(false)} />}
    </>
  );
}
