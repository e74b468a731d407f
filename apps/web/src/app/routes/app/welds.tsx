// Weld log (foreman, QA manager): the production welds of one job at a time. The welds already logged are
// listed with each welder's check; new welds are typed as rows — stamps typed or picked, joint details
// copied from the row above or from the WPS, any column filled down — each welder checked live against
// their qualifications, and each weld checked again by the server when saved (flagged, never refused).
// The QA manager sees the welds waiting for a disposition above the job.
import { processes, weldJointWords, weldLayerNames, type Weld, type WeldWelder } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { Link, useBlocker, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { AlertIcon, CheckCircleIcon, PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { procedureQueries } from '@/features/procedures/api/procedure-queries';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { useCreateWeld } from '@/features/welds/api/create-weld';
import { weldQueries } from '@/features/welds/api/weld-queries';
import { WeldCheckChip } from '@/features/welds/components/weld-check';
import {
  bodyOf,
  fillDown,
  fromProcedure,
  liveCheck,
  rowAfter,
  type RowProblems,
  type WeldField,
  type WeldRowDraft,
} from '@/features/welds/model/weld-draft';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { companyToday } from '@/lib/company-day';

export default function WeldLogRoute() {
  return (
    <RequireRole roles={['qa_manager', 'foreman']} title="Weld log" message="The weld log is kept by foremen and the QA manager.">
      <WeldLogScreen />
    </RequireRole>
  );
}

function WeldLogScreen() {
  const me = useUser();
  const [params, setParams] = useSearchParams();
  const shops = useQuery(shopQueries.list());
  const activeShops = (shops.data ?? []).filter((s) => s.active);
  const shopId = params.get('shopId') ?? activeShops[0]?.id ?? '';
  const job = params.get('job') ?? '';
  const [jobText, setJobText] = useState(job);
  useEffect(() => setJobText(job), [job]);

  return (
    <>
      <PageHeader
        title="Weld log"
        description="Log each production weld of a job with the welder of each process. Every welder is checked against their qualification and continuity on the day welded; a weld outside is saved and flagged for the QA manager."
      />
      {me.role === 'qa_manager' && <ReviewQueue />}
      <form
        className="mb-4 flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setParams({ shopId, job: jobText.trim() }, { replace: true });
        }}
      >
        <SelectField label="Shop" wrapperClassName="w-64" value={shopId} onChange={(e) => setParams({ shopId: e.target.value, job }, { replace: true })}>
          {activeShops.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name} ({s.code})
            </option>
          ))}
        </SelectField>
        <TextField label="Job or traveler" wrapperClassName="w-56" value={jobText} placeholder="HPF-2433" onChange={(e) => setJobText(e.target.value)} />
        <Button type="submit" variant="primary" disabled={!jobText.trim()}>
          Open job
        </Button>
      </form>
      {shops.isPending ? (
        <LoadingState label="Loading shops…" />
      ) : shops.isError ? (
        <ErrorState error={shops.error} onRetry={() => void shops.refetch()} />
      ) : !shopId ? (
        <EmptyState title="No shop to log for">You are not assigned to a shop yet. Ask the QA manager to assign you.</EmptyState>
      ) : !job ? (
        <EmptyState title="Choose a job">Type the job or traveler number the welds belong to, then open it.</EmptyState>
      ) : (
        <Job key={`${shopId}:${job}`} shopId={shopId} job={job} />
      )}
      <SafetyNotice className="mt-6" />
    </>
  );
}

function ReviewQueue() {
  const queue = useQuery(weldQueries.list({ flagged: 'pending' }));
  if (queue.isPending || queue.isError || queue.data.items.length === 0) return null;
  return (
    <section aria-labelledby="weld-review" className="mb-6 rounded-md border border-amber-300 bg-amber-50 p-3">
      <h2 id="weld-review" className="mb-2 flex items-center gap-2 text-base font-semibold text-amber-900">
        <AlertIcon className="size-4" /> Flagged welds waiting for a disposition ({queue.data.total})
      </h2>
      <ul className="divide-y divide-amber-200">
        {queue.data.items.map((w) => (
          <li key={w.id} className="flex flex-wrap items-center justify-between gap-2 py-1 text-sm">
            <span>
              Job <strong>{w.jobReference}</strong>, weld <strong>{w.weldNumber}</strong> ({w.weldedOn}, {w.shop.name}) —{' '}
              {w.passes.filter((p) => !p.qualified).map((p) => `${p.welder.stamp} ${p.process}`).join(', ')}
            </span>
            <Link className="font-semibold text-accent-700 underline" to={paths.weld.href(w.id)}>
              Review weld {w.weldNumber}
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}

function Job({ shopId, job }: { shopId: string; job: string }) {
  const welds = useQuery(weldQueries.list({ job }));
  return (
    <div className="space-y-6">
      <section aria-labelledby="logged">
        <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
          <h2 id="logged" className="text-lg font-semibold">
            Welds of job {job}
          </h2>
          {welds.data && welds.data.items.length > 0 && (
            <div className="flex gap-2 text-sm">
              <a className="font-semibold text-accent-700 underline" href={`/api/welds/job-summary.pdf?job=${encodeURIComponent(job)}`} download>
                Job summary (PDF)
              </a>
              <a className="font-semibold text-accent-700 underline" href={`/api/welds/job-summary.csv?job=${encodeURIComponent(job)}`} download>
                Job summary (CSV)
              </a>
            </div>
          )}
        </div>
        {welds.isPending ? (
          <LoadingState label="Loading the job’s welds…" />
        ) : welds.isError ? (
          <ErrorState error={welds.error} onRetry={() => void welds.refetch()} />
        ) : welds.data.items.length === 0 ? (
          <EmptyState title="No welds logged on this job yet">Add them below, one row per weld.</EmptyState>
        ) : (
          <LoggedWelds welds={welds.data.items} />
        )}
      </section>
      <NewWelds shopId={shopId} job={job} lastNumber={welds.data?.items.at(-1)?.weldNumber ?? ''} />
    </div>
  );
}

function LoggedWelds({ welds }: { welds: Weld[] }) {
  return (
    <div className="overflow-x-auto rounded-md border border-stone-200 bg-white">
      <table className="w-full text-sm">
        <caption className="sr-only">Welds logged on this job</caption>
        <thead className="bg-stone-50 text-left text-stone-600">
          <tr>
            <th className="px-3 py-2">Weld</th>
            <th className="px-3 py-2">Welded</th>
            <th className="px-3 py-2">Shop</th>
            <th className="px-3 py-2">Welders</th>
            <th className="px-3 py-2">Joint</th>
            <th className="px-3 py-2">Check</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-stone-100">
          {welds.map((w) => (
            <tr key={w.id}>
              <td className="px-3 py-2 font-semibold">
                <Link className="text-accent-700 underline" to={paths.weld.href(w.id)}>
                  {w.weldNumber}
                </Link>
              </td>
              <td className="px-3 py-2">{w.weldedOn}</td>
              <td className="px-3 py-2">{w.shop.code}</td>
              <td className="px-3 py-2">
                {w.passes.map((p) => (
                  <div key={p.id}>
                    <span className="font-mono font-semibold">{p.welder.stamp}</span> {p.process} ({weldLayerNames[p.layer].toLowerCase()})
                  </div>
                ))}
              </td>
              <td className="px-3 py-2">{weldJointWords(w.joint)}</td>
              <td className="px-3 py-2">
                <WeldCheckChip weld={w} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

const processOptions = processes.map((p) => <option key={p}>{p}</option>);

type RowState = { problems?: RowProblems; error?: string; saved?: Weld };

function NewWelds({ shopId, job, lastNumber }: { shopId: string; job: string; lastNumber: string }) {
  const me = useUser();
  const today = companyToday(me.timeZone);
  const [rows, setRows] = useState<WeldRowDraft[]>(() => {
    const first = rowAfter(undefined, today);
    return [{ ...first, weldNumber: lastNumber ? '' : '1' }];
  });
  const [state, setState] = useState<Record<string, RowState>>({});
  const [formError, setFormError] = useState<string>();
  const [saving, setSaving] = useState(false);
  const create = useCreateWeld();
  const procedures = useQuery(procedureQueries.list({ status: 'active' }));

  // The welders named on the rows, looked up by stamp (exact match first), for the body and the live check.
  const stamps = useMemo(
    () => [...new Set(rows.flatMap((r) => [r.stamp, r.fillStamp]).map((s) => s.trim().toUpperCase()).filter(Boolean))],
    [rows],
  );
  // One query for all the stamps (not useQueries: that would put a query-core module only this screen
  // uses into the framework chunk every first paint loads; see the bundle budget test).
  const found = useQuery({ ...weldQueries.weldersByStamp(shopId, stamps), placeholderData: (previous) => previous });
  const welders = new Map<string, WeldWelder>();
  for (const stamp of stamps) {
    const hit = found.data?.[stamp];
    if (hit) welders.set(stamp, hit);
  }
  const all = useQuery(weldQueries.welders(shopId, ''));

  const dirty = rows.some((r) => !state[r.key]?.saved && (r.weldNumber.trim() || r.stamp.trim() || r.thickness.trim()));
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);

  const set = (key: string, patch: Partial<WeldRowDraft>) => setRows((rs) => rs.map((r) => (r.key === key ? { ...r, ...patch } : r)));
  const add = () => setRows((rs) => [...rs, rowAfter(rs.at(-1), today)]);
  const fill = (field: WeldField) => setRows((rs) => fillDown(rs, field));

  const save = async () => {
    setFormError(undefined);
    const pending = rows.filter((r) => !state[r.key]?.saved);
    const next: Record<string, RowState> = { ...state };
    const bodies = pending.map((r) => ({ r, b: bodyOf(r, { shopId, jobReference: job, welders }) }));
    let bad = 0;
    for (const { r, b } of bodies)
      if ('problems' in b) {
        next[r.key] = { problems: b.problems };
        bad++;
      }
    if (bad) {
      setState(next);
      setFormError(`${bad} ${bad === 1 ? 'row needs' : 'rows need'} attention: see the messages in the table.`);
      return;
    }
    setSaving(true);
    for (const { r, b } of bodies) {
      if (!('body' in b)) continue;
      try {
        next[r.key] = { saved: await create.mutateAsync(b.body) };
      } catch (error) {
        const fields = isApiError(error) ? error.fields : {};
        const problems: RowProblems = {};
        for (const [k, v] of Object.entries(fields)) {
          const f = k.startsWith('joint.') ? k.slice(6) : k.startsWith('passes.') ? 'stamp' : k;
          (problems as Record<string, string>)[f] = v;
        }
        next[r.key] = { problems, error: isApiError(error) ? error.message : 'The weld could not be saved.' };
      }
      setState({ ...next });
    }
    setSaving(false);
    const failed = bodies.filter(({ r }) => !next[r.key]?.saved).length;
    if (failed) setFormError(`${failed} ${failed === 1 ? 'weld was' : 'welds were'} not saved: see the messages in the table.`);
  };

  const col = (label: string, field?: WeldField) => (
    <th className="px-2 py-2 align-bottom" scope="col">
      <div className="flex flex-col gap-1">
        <span>{label}</span>
        {field && rows.length > 1 && (
          <button type="button" className="min-h-9 rounded border border-stone-300 px-2 text-xs font-normal text-stone-700 hover:bg-stone-100" onClick={() => fill(field)} aria-label={`Fill ${label.toLowerCase()} down from the first row`}>
            Fill down
          </button>
        )}
      </div>
    </th>
  );
  const input = 'min-h-11 w-full rounded border border-stone-300 px-2 text-base sm:min-h-9 sm:text-sm';
  const problem = (r: WeldRowDraft, f: WeldField) => state[r.key]?.problems?.[f];
  const cls = (r: WeldRowDraft, f: WeldField) => `${input} ${problem(r, f) ? 'border-red-500 bg-red-50' : ''}`;

  return (
    <section aria-labelledby="new-welds" className="space-y-3">
      <h2 id="new-welds" className="text-lg font-semibold">
        Log welds
      </h2>
      <p className="text-sm text-stone-600">
        One row per weld. A new row copies the date, WPS, welders and joint of the row above; “Fill down” copies the first row’s value to every row. Choosing a WPS fills its F-No.{lastNumber ? ` The last weld logged on this job is ${lastNumber}.` : ''}
      </p>
      <datalist id="weld-stamps">
        {(all.data ?? []).map((w) => (
          <option key={w.id} value={w.stamp}>
            {w.name}
          </option>
        ))}
      </datalist>
      <div className="overflow-x-auto rounded-md border border-stone-200 bg-white">
        <table className="min-w-[1400px] text-sm">
          <caption className="sr-only">New welds of job {job}</caption>
          <thead className="bg-stone-50 text-left text-stone-600">
            <tr>
              {col('Weld no.')}
              {col('Date welded', 'weldedOn')}
              {col('WPS', 'procedureId')}
              {col('Stamp', 'stamp')}
              {col('Process', 'process')}
              {col('Fill welder', 'fillStamp')}
              {col('Plate or pipe', 'form')}
              {col('Groove or fillet', 'weld')}
              {col('Position', 'position')}
              {col('Thickness', 'thickness')}
              {col('Pipe OD', 'outsideDiameter')}
              {col('NPS / Sch', 'nps')}
              {col('F-No.', 'fNumber')}
              {col('Backing', 'backing')}
              {col('Vertical', 'progression')}
              {col('Examination')}
              {col('Check')}
            </tr>
          </thead>
          <tbody className="divide-y divide-stone-100">
            {rows.map((r, i) => {
              const st = state[r.key];
              const locked = Boolean(st?.saved);
              const checks = [liveCheck(welders.get(r.stamp.trim().toUpperCase()), r.process, r), r.fillStamp.trim() ? liveCheck(welders.get(r.fillStamp.trim().toUpperCase()), r.fillProcess || r.process, r) : null].filter(
                (c): c is NonNullable<typeof c> => c !== null,
              );
              const errs = Object.entries(st?.problems ?? {});
              return (
                <tr key={r.key} className={locked ? 'bg-stone-50' : ''} aria-label={`Row ${i + 1}`}>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Weld number" className={cls(r, 'weldNumber')} value={r.weldNumber} disabled={locked} onChange={(e) => set(r.key, { weldNumber: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Date welded" type="date" max={today} className={cls(r, 'weldedOn')} value={r.weldedOn} disabled={locked} onChange={(e) => set(r.key, { weldedOn: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select
                      aria-label="WPS"
                      className={cls(r, 'procedureId')}
                      value={r.procedureId}
                      disabled={locked}
                      onChange={(e) => {
                        const wps = procedures.data?.items.find((p) => p.id === e.target.value);
                        setRows((rs) => rs.map((x) => (x.key === r.key ? (wps ? fromProcedure(x, wps) : { ...x, procedureId: '' }) : x)));
                      }}
                    >
                      <option value="">—</option>
                      {(procedures.data?.items ?? []).map((p) => (
                        <option key={p.id} value={p.id}>
                          {p.number} rev {p.revision}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Stamp" list="weld-stamps" className={`${cls(r, 'stamp')} font-mono uppercase`} value={r.stamp} disabled={locked} onChange={(e) => set(r.key, { stamp: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Process" className={cls(r, 'process')} value={r.process} disabled={locked} onChange={(e) => set(r.key, { process: e.target.value })}>
                      {processOptions}
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Fill welder stamp" list="weld-stamps" placeholder="same welder" className={`${cls(r, 'fillStamp')} font-mono uppercase`} value={r.fillStamp} disabled={locked} onChange={(e) => set(r.key, { fillStamp: e.target.value })} />
                    {r.fillStamp.trim() && (
                      <select aria-label="Fill process" className={`${input} mt-1`} value={r.fillProcess || r.process} disabled={locked} onChange={(e) => set(r.key, { fillProcess: e.target.value })}>
                        {processOptions}
                      </select>
                    )}
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Plate or pipe" className={cls(r, 'form')} value={r.form} disabled={locked} onChange={(e) => set(r.key, { form: e.target.value as WeldRowDraft['form'] })}>
                      <option value="pipe">Pipe</option>
                      <option value="plate">Plate</option>
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Groove or fillet" className={cls(r, 'weld')} value={r.weld} disabled={locked} onChange={(e) => set(r.key, { weld: e.target.value as WeldRowDraft['weld'] })}>
                      <option value="groove">Groove</option>
                      <option value="fillet">Fillet</option>
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Position" className={cls(r, 'position')} value={r.position} disabled={locked} onChange={(e) => set(r.key, { position: e.target.value as WeldRowDraft['position'] })}>
                      <option value="F">F (flat)</option>
                      <option value="H">H (horizontal)</option>
                      <option value="V">V (vertical)</option>
                      <option value="O">O (overhead)</option>
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Thickness" placeholder="3/8 or 10 mm" className={cls(r, 'thickness')} value={r.thickness} disabled={locked} onChange={(e) => set(r.key, { thickness: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="Pipe OD" placeholder={r.form === 'pipe' ? '6.625 in' : '—'} className={cls(r, 'outsideDiameter')} value={r.outsideDiameter} disabled={locked || r.form !== 'pipe'} onChange={(e) => set(r.key, { outsideDiameter: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <div className="flex gap-1">
                      <input aria-label="NPS" placeholder="6" className={`${cls(r, 'nps')} w-14`} value={r.nps} disabled={locked || r.form !== 'pipe'} onChange={(e) => set(r.key, { nps: e.target.value })} />
                      <input aria-label="Schedule" placeholder="80" className={`${cls(r, 'schedule')} w-16`} value={r.schedule} disabled={locked || r.form !== 'pipe'} onChange={(e) => set(r.key, { schedule: e.target.value })} />
                    </div>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <input aria-label="F-No." inputMode="numeric" className={`${cls(r, 'fNumber')} w-16`} value={r.fNumber} disabled={locked} onChange={(e) => set(r.key, { fNumber: e.target.value })} />
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Backing" className={cls(r, 'backing')} value={r.backing} disabled={locked} onChange={(e) => set(r.key, { backing: e.target.value as WeldRowDraft['backing'] })}>
                      <option value="without">Without</option>
                      <option value="with">With</option>
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Vertical progression" className={cls(r, 'progression')} value={r.progression} disabled={locked} onChange={(e) => set(r.key, { progression: e.target.value as WeldRowDraft['progression'] })}>
                      <option value="">—</option>
                      <option value="uphill">Uphill</option>
                      <option value="downhill">Downhill</option>
                    </select>
                  </td>
                  <td className="px-2 py-2 align-top">
                    <select aria-label="Examination" className={cls(r, 'examMethod')} value={r.examMethod} disabled={locked} onChange={(e) => set(r.key, { examMethod: e.target.value as WeldRowDraft['examMethod'] })}>
                      <option value="">None yet</option>
                      <option value="visual">Visual</option>
                      <option value="RT">RT</option>
                      <option value="UT">UT</option>
                    </select>
                    {r.examMethod && (
                      <div className="mt-1 flex gap-1">
                        <input aria-label="Report number" placeholder="Report no." className={`${input} w-28`} value={r.examReport} disabled={locked} onChange={(e) => set(r.key, { examReport: e.target.value })} />
                        <select aria-label="Examination result" className={cls(r, 'examResult')} value={r.examResult} disabled={locked} onChange={(e) => set(r.key, { examResult: e.target.value as WeldRowDraft['examResult'] })}>
                          <option value="">—</option>
                          <option value="accepted">Accepted</option>
                          <option value="rejected">Rejected</option>
                        </select>
                      </div>
                    )}
                  </td>
                  <td className="min-w-64 px-2 py-2 align-top">
                    {st?.saved ? (
                      <div className="space-y-1">
                        <WeldCheckChip weld={st.saved} />
                        <Link className="block text-accent-700 underline" to={paths.weld.href(st.saved.id)}>
                          Weld {st.saved.weldNumber}: check and proof
                        </Link>
                      </div>
                    ) : (
                      <ul className="space-y-1">
                        {checks.map((c) => (
                          <li key={`${c.stamp}:${c.process}`} className={c.within === false ? 'text-amber-900' : c.within ? 'text-emerald-800' : 'text-stone-600'}>
                            {c.within === null ? (
                              `${c.stamp}: complete the joint to check`
                            ) : c.within ? (
                              <span className="inline-flex items-center gap-1">
                                <CheckCircleIcon className="size-4" /> {c.stamp} {c.process}: within {c.number}
                              </span>
                            ) : (
                              <>
                                <span className="inline-flex items-center gap-1 font-semibold">
                                  <AlertIcon className="size-4" /> {c.stamp} {c.process}: will be flagged
                                </span>
                                {c.reasons.slice(0, 3).map((x, k) => (
                                  <span key={k} className="block text-xs">
                                    {x.message} ({x.clause})
                                  </span>
                                ))}
                              </>
                            )}
                          </li>
                        ))}
                        {errs.map(([f, m]) => (
                          <li key={f} className="text-red-700" role="alert">
                            {m}
                          </li>
                        ))}
                        {st?.error && !errs.length && (
                          <li className="text-red-700" role="alert">
                            {st.error}
                          </li>
                        )}
                      </ul>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <FormError message={formError} />
      <div className="sticky bottom-0 flex flex-wrap items-center gap-3 border-t border-stone-200 bg-white/95 py-3">
        <Button onClick={add}>
          <PlusIcon /> Add a row
        </Button>
        <Button variant="primary" busy={saving} onClick={() => void save()} disabled={!rows.some((r) => !state[r.key]?.saved)}>
          Save welds
        </Button>
        <span role="status" className="text-sm text-stone-600">
          {rows.filter((r) => state[r.key]?.saved).length} of {rows.length} saved
        </span>
      </div>
      <ConfirmDialog
        open={blocker.state === 'blocked'}
        title="Leave without saving?"
        confirmLabel="Leave and discard"
        onConfirm={() => blocker.proceed?.()}
        onCancel={() => blocker.reset?.()}
      >
        Some welds typed here are not saved. They are lost if you leave now.
      </ConfirmDialog>
    </section>
  );
}
