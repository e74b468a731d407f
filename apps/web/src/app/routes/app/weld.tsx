// The weld page: the auditor's answer for one production weld — who made it, whether each welder was
// qualified for that joint and in continuity on the day welded (with the reasons and clauses when not),
// the proof behind each answer, and the QA manager's disposition of a flagged weld.
import { weldDispositionNames, weldDispositions, weldExaminationWords, weldJointWords, weldLayerNames, type QualifiedOnAnswer, type WeldDetail, type WeldDisposition } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { useDisposeWeld } from '@/features/welds/api/dispose-weld';
import { weldQueries } from '@/features/welds/api/weld-queries';
import { WeldCheckChip } from '@/features/welds/components/weld-check';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';

export default function WeldRoute() {
  return (
    <RequireRole roles={['qa_manager', 'foreman']} title="Weld" message="Welds are read by foremen and the QA manager.">
      <WeldScreen />
    </RequireRole>
  );
}

function WeldScreen() {
  const { id = '' } = useParams();
  const weld = useQuery(weldQueries.detail(id));
  if (weld.isPending) return <LoadingState label="Loading the weld…" />;
  if (weld.isError) return <ErrorState error={weld.error} onRetry={() => void weld.refetch()} />;
  const w = weld.data;
  return (
    <>
      <PageHeader
        title={`Weld ${w.weldNumber} · job ${w.jobReference}`}
        description={`${w.shop.name} · welded ${w.weldedOn}${w.procedure ? ` · WPS ${w.procedure.number} rev ${w.procedure.revision}` : ''}`}
        actions={
          <div className="flex flex-wrap gap-2">
            <a className="inline-flex min-h-11 items-center rounded-md border border-stone-300 px-3 font-semibold sm:min-h-9" href={`/api/welds/${encodeURIComponent(w.id)}/pdf`} download>
              Weld page (PDF)
            </a>
            <Link className="inline-flex min-h-11 items-center rounded-md px-3 font-semibold text-accent-700 underline sm:min-h-9" to={paths.welds.href(`shopId=${w.shop.id}&job=${encodeURIComponent(w.jobReference)}`)}>
              Back to job {w.jobReference}
            </Link>
          </div>
        }
      />
      <div className="space-y-4">
        <Card>
          <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2">
            <div>
              <dt className="text-sm text-stone-500">Check on entry</dt>
              <dd>
                <WeldCheckChip weld={w} />
                <span className="ml-2 text-xs text-stone-500">
                  checked {new Date(w.checkedAt).toLocaleString()} with rules {w.rulesVersion}
                </span>
              </dd>
            </div>
            <div>
              <dt className="text-sm text-stone-500">Joint</dt>
              <dd>{weldJointWords(w.joint)}</dd>
            </div>
            <div>
              <dt className="text-sm text-stone-500">Examination</dt>
              <dd>{weldExaminationWords(w.examination)}</dd>
            </div>
            <div>
              <dt className="text-sm text-stone-500">Logged by</dt>
              <dd>
                {w.loggedBy ?? '—'} on {new Date(w.createdAt).toLocaleString()}
              </dd>
            </div>
            {w.note && (
              <div className="sm:col-span-2">
                <dt className="text-sm text-stone-500">Note</dt>
                <dd>{w.note}</dd>
              </div>
            )}
          </dl>
        </Card>
        {w.passes.map((p) => {
          const proof = w.proof.find((x) => x.passId === p.id)?.answer;
          return (
            <Card key={p.id}>
              <h2 className="text-lg font-semibold">
                <span className="font-mono">{p.welder.stamp}</span> {p.welder.name} · {p.process} · {weldLayerNames[p.layer]}
              </h2>
              <p className={`mt-1 font-semibold ${p.qualified ? 'text-emerald-800' : 'text-red-800'}`}>
                {p.qualified
                  ? `Qualified for this joint and in continuity on ${w.weldedOn}${p.qualificationNumber ? ` (${p.qualificationNumber})` : ''}.`
                  : `Not qualified for this joint on ${w.weldedOn}.`}
                {p.countedForContinuity ? ' Counted as documented use of the process.' : ' Not counted as documented use of the process.'}
              </p>
              {p.reasons.length > 0 && (
                <ul className="mt-2 list-disc space-y-1 pl-5 text-sm">
                  {p.reasons.map((r, i) => (
                    <li key={i}>
                      {r.message} <span className="text-stone-500">({r.clause})</span>
                    </li>
                  ))}
                </ul>
              )}
              {proof && <ProofView proof={proof} weldedOn={w.weldedOn} />}
            </Card>
          );
        })}
        <Disposition weld={w} />
        <SafetyNotice />
      </div>
    </>
  );
}

const STATE_WORDS: Record<string, string> = {
  'in-force': 'In force',
  'not-yet-qualified': 'Not yet qualified',
  superseded: 'Superseded',
  revoked: 'Revoked',
  lapsed: 'Lapsed',
};

/** The proof chain of one welder (the qualified-on answer): each qualification with its limits and continuity. */
function ProofView({ proof, weldedOn }: { proof: QualifiedOnAnswer; weldedOn: string }) {
  const quals = proof.evidence.qualifications;
  if (quals.length === 0) return null;
  return (
    <details className="mt-3">
      <summary className="cursor-pointer font-semibold text-accent-700">The proof: qualification, limits and continuity</summary>
      <div className="mt-2 space-y-3 text-sm">
        {quals.map((q) => (
          <div key={q.id} className="rounded border border-stone-200 p-2">
            <p className="font-semibold">
              {q.number} · {q.codeName} {q.process} · certified {q.certifiedOn} by {q.certifiedBy} · coupon tested {q.coupon.testedOn} ({q.coupon.testPosition}, WPS {q.coupon.wps})
            </p>
            <ul className="mt-1 space-y-0.5">
              {q.limits.map((l, k) => (
                <li key={k}>
                  {l.text} <span className="text-stone-500">({l.clause})</span>
                </li>
              ))}
            </ul>
            <p className="mt-1">
              Continuity on {weldedOn}: <strong>{STATE_WORDS[q.continuity.state] ?? q.continuity.state}</strong>
              {q.continuity.lapsesOn ? `, in force until ${q.continuity.lapsesOn} on the evidence up to that day` : ''} ({q.continuity.clause})
            </p>
            {q.continuity.evidence.length > 0 && (
              <ul className="mt-1 space-y-0.5 text-xs">
                {q.continuity.evidence.map((e, k) => (
                  <li key={k}>
                    {e.date} · {e.kind === 'test' ? 'test' : e.source === 'weld-log' ? 'production weld' : 'use'}
                    {e.job ? ` · job ${e.job}` : ''}
                    {e.weldNumber ? ` · weld ${e.weldNumber}` : ''}
                    {e.shop ? ` · ${e.shop}` : ''}
                    {e.loggedBy ? ` · logged by ${e.loggedBy}` : ''} · {e.counted ? 'counted' : `not counted${e.note ? `: ${e.note}` : ''}`}
                  </li>
                ))}
              </ul>
            )}
            {q.revocation && (
              <p className="mt-1 font-semibold text-red-800">
                Revoked on {q.revocation.revokedOn}: {q.revocation.reason}
              </p>
            )}
          </div>
        ))}
        <p className="text-xs text-stone-500">{proof.notice}</p>
      </div>
    </details>
  );
}

function Disposition({ weld }: { weld: WeldDetail }) {
  const me = useUser();
  const dispose = useDisposeWeld();
  const [decision, setDecision] = useState<WeldDisposition | ''>('');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  if (weld.disposition)
    return (
      <Card>
        <h2 className="text-lg font-semibold">Disposition</h2>
        <p>
          {weldDispositionNames[weld.disposition.decision]} — {weld.disposition.reason}
        </p>
        <p className="text-sm text-stone-500">
          by {weld.disposition.by ?? '—'} on {new Date(weld.disposition.at).toLocaleString()}
        </p>
      </Card>
    );
  if (!weld.flagged) return null;
  if (me.role !== 'qa_manager')
    return (
      <Card>
        <p className="font-semibold text-amber-900">This weld waits for the QA manager’s disposition.</p>
      </Card>
    );
  return (
    <Card>
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          setErrors({});
          if (!decision) return setErrors({ decision: 'Choose what was decided' });
          dispose.mutate(
            { id: weld.id, decision, reason },
            { onError: (error) => setErrors(isApiError(error) ? { ...error.fields, form: error.message } : { form: 'The disposition could not be saved.' }) },
          );
        }}
      >
        <h2 className="text-lg font-semibold">Disposition of this flagged weld</h2>
        <SelectField label="Decision" wrapperClassName="max-w-sm" value={decision} error={errors.decision} onChange={(e) => setDecision(e.target.value as WeldDisposition)}>
          <option value="">Choose…</option>
          {weldDispositions.map((d) => (
            <option key={d} value={d}>
              {weldDispositionNames[d]}
            </option>
          ))}
        </SelectField>
        <TextField label="Reason" value={reason} error={errors.reason} onChange={(e) => setReason(e.target.value)} placeholder="e.g. RT of the weld accepted, report RT-24-0190" />
        <FormError message={errors.form && !errors.reason && !errors.decision ? errors.form : undefined} />
        <Button type="submit" variant="primary" busy={dispose.isPending}>
          Record disposition
        </Button>
      </form>
    </Card>
  );
}
