// Crew finder: the foreman's (and QA manager's) question — who may weld this joint from today through a
// day, longest in force first, and who nearly may, with the one reason and its clause. The search sits in
// the URL, so a crew found on the tablet opens the same way at the office.
import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import {
  addDays,
  codeIds,
  codeNames,
  jointPositionWords,
  processes,
  type CrewFinderAnswer,
} from '@beadroll/rules';
import { Button } from '@/components/ui/button';
import { Pagination } from '@/components/ui/data-table';
import { SelectField, TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { crewFinderQueries } from '@/features/crew-finder/api/crew-finder-queries';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { companyToday } from '@/lib/company-day';

const PAGE = 50;
const FIELDS = [
  'process', 'code', 'shopId', 'through', 'form', 'weld', 'position', 'thickness', 'nps', 'schedule',
  'outsideDiameter', 'fNumber', 'backing', 'progression',
] as const;
type Field = (typeof FIELDS)[number];
type Draft = Record<Field, string>;

const blank: Draft = {
  process: 'SMAW', code: '', shopId: '', through: '', form: 'pipe', weld: 'groove', position: '6G', thickness: '',
  nps: '', schedule: '', outsideDiameter: '', fNumber: '', backing: 'without', progression: '',
};

const positionLabels: Record<string, string> = {
  F: 'Flat (F)', H: 'Horizontal (H)', V: 'Vertical (V)', O: 'Overhead (O)',
  '1G': '1G — flat', '2G': '2G — horizontal', '3G': '3G — vertical', '4G': '4G — overhead',
  '5G': '5G — fixed pipe, axis horizontal', '6G': '6G — fixed pipe at 45°',
  '1F': '1F — flat fillet', '2F': '2F — horizontal fillet', '3F': '3F — vertical fillet', '4F': '4F — overhead fillet',
  '5F': '5F — fixed pipe fillet',
};

/** The Friday of this week (today when it is Friday; next week's when the week's Friday has passed). */
function thisFriday(today: string): string {
  const day = new Date(`${today}T12:00:00Z`).getUTCDay();
  return addDays(today, (5 - day + 7) % 7);
}

export default function CrewFinderRoute() {
  return (
    <RequireRole roles={['qa_manager', 'foreman']} title="Crew finder">
      <CrewFinderScreen />
    </RequireRole>
  );
}

function CrewFinderScreen() {
  const me = useUser();
  const today = companyToday(me.timeZone);
  const [params, setParams] = useSearchParams();
  const asked = Object.fromEntries(FIELDS.flatMap((f) => (params.get(f) ? [[f, params.get(f) as string]] : [])));
  const crewPage = Math.max(1, Number.parseInt(params.get('page') ?? '1', 10) || 1);
  const nearPage = Math.max(1, Number.parseInt(params.get('nearPage') ?? '1', 10) || 1);
  const [draft, setDraft] = useState<Draft>({ ...blank, ...asked });
  const shops = useQuery(shopQueries.list());
  const searching = Boolean(params.get('process'));
  const search = {
    ...asked,
    limit: String(PAGE),
    offset: String((crewPage - 1) * PAGE),
    nearLimit: String(PAGE),
    nearOffset: String((nearPage - 1) * PAGE),
  };
  const answer = useQuery({ ...crewFinderQueries.search(search), enabled: searching });
  const fieldErrors = answer.isError && isApiError(answer.error) ? answer.error.fields : {};

  const set = (field: Field) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [field]: e.target.value }));
  const go = (next: Partial<Draft>, pages: { page?: number; nearPage?: number } = {}) => {
    const merged = { ...draft, ...next };
    const out = new URLSearchParams();
    for (const f of FIELDS) {
      const v = merged[f].trim();
      if (!v) continue;
      if (merged.form !== 'pipe' && (f === 'nps' || f === 'schedule' || f === 'outsideDiameter')) continue;
      out.set(f, v);
    }
    if (pages.page && pages.page > 1) out.set('page', String(pages.page));
    if (pages.nearPage && pages.nearPage > 1) out.set('nearPage', String(pages.nearPage));
    setParams(out);
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    go({});
  };
  const quick = (through: string) => {
    setDraft((d) => ({ ...d, through }));
  };
  const pipe = draft.form === 'pipe';

  return (
    <>
      <PageHeader
        title="Crew finder"
        description="Who may weld this joint from today through the day you choose, longest in force first — and who nearly may, with the reason."
      />
      <form aria-label="Joint to weld" onSubmit={submit} className="mb-4 rounded-lg border border-stone-200 bg-white p-4" noValidate>
        <fieldset className="grid gap-3 sm:grid-cols-3 lg:grid-cols-4">
          <legend className="mb-2 text-sm font-semibold text-stone-800">The joint</legend>
          <SelectField label="Process" value={draft.process} onChange={set('process')} error={fieldErrors.process}>
            {processes.map((p) => (
              <option key={p} value={p}>{p}</option>
            ))}
          </SelectField>
          <SelectField label="Code" value={draft.code} onChange={set('code')} error={fieldErrors.code}>
            <option value="">Any code</option>
            {codeIds.map((c) => (
              <option key={c} value={c}>{codeNames[c]}</option>
            ))}
          </SelectField>
          <SelectField label="Form" value={draft.form} onChange={set('form')} error={fieldErrors.form}>
            <option value="pipe">Pipe</option>
            <option value="plate">Plate</option>
          </SelectField>
          <SelectField label="Weld" value={draft.weld} onChange={set('weld')} error={fieldErrors.weld}>
            <option value="groove">Groove</option>
            <option value="fillet">Fillet</option>
          </SelectField>
          <SelectField label="Position" value={draft.position} onChange={set('position')} error={fieldErrors.position}>
            {Object.keys(jointPositionWords).map((p) => (
              <option key={p} value={p}>{positionLabels[p] ?? p}</option>
            ))}
          </SelectField>
          {pipe && (
            <>
              <TextField label="NPS" value={draft.nps} onChange={set('nps')} error={fieldErrors.nps} hint="e.g. 6" inputMode="decimal" />
              <TextField label="Schedule" value={draft.schedule} onChange={set('schedule')} error={fieldErrors.schedule} hint="e.g. 80 or XS" />
              <TextField label="Outside diameter" value={draft.outsideDiameter} onChange={set('outsideDiameter')} error={fieldErrors.outsideDiameter} hint="Instead of NPS, e.g. 6.625 in" />
            </>
          )}
          <TextField
            label="Thickness"
            value={draft.thickness}
            onChange={set('thickness')}
            error={fieldErrors.thickness}
            hint={pipe ? 'Weld metal; the wall of the NPS and schedule when empty' : 'Weld metal (groove) or base metal (fillet), e.g. 0.5 in or 12 mm'}
          />
          <TextField label="F-No." value={draft.fNumber} onChange={set('fNumber')} error={fieldErrors.fNumber} inputMode="numeric" hint="Filler metal F-Number, e.g. 4" />
          <SelectField label="Backing" value={draft.backing} onChange={set('backing')} error={fieldErrors.backing}>
            <option value="without">Without backing (open root)</option>
            <option value="with">With backing</option>
          </SelectField>
          <SelectField label="Progression" value={draft.progression} onChange={set('progression')} error={fieldErrors.progression}>
            <option value="">Not vertical / any</option>
            <option value="uphill">Uphill</option>
            <option value="downhill">Downhill</option>
          </SelectField>
        </fieldset>
        <fieldset className="mt-4 grid gap-3 sm:grid-cols-3 lg:grid-cols-4">
          <legend className="mb-2 text-sm font-semibold text-stone-800">Where and for how long</legend>
          <SelectField label="Shop" value={draft.shopId} onChange={set('shopId')} error={fieldErrors.shopId}>
            <option value="">{me.role === 'qa_manager' ? 'All shops' : 'All my shops'}</option>
            {(shops.data ?? []).map((s) => (
              <option key={s.id} value={s.id}>{s.name}</option>
            ))}
          </SelectField>
          <TextField
            label="Through"
            type="date"
            min={today}
            value={draft.through}
            onChange={set('through')}
            error={fieldErrors.through}
            hint="The last day of the work; empty means today only"
          />
          <div className="flex flex-wrap items-end gap-2 sm:col-span-2" role="group" aria-label="Quick choices for the last day">
            <Button onClick={() => quick(today)}>Today</Button>
            <Button onClick={() => quick(thisFriday(today))}>This Friday</Button>
            <Button onClick={() => quick(addDays(today, 42))}>6 weeks</Button>
          </div>
        </fieldset>
        <div className="mt-4 flex items-center gap-3">
          <Button type="submit" variant="primary" busy={searching && answer.isFetching}>
            Find the crew
          </Button>
        </div>
      </form>

      {!searching ? (
        <EmptyState title="Describe the joint to find a crew">
          Choose the process and the joint as it will be welded, and the last day of the work. The crew are the welders whose
          qualification covers the joint and stays in force through that day.
        </EmptyState>
      ) : answer.isPending ? (
        <LoadingState label="Finding the crew…" />
      ) : answer.isError ? (
        <ErrorState
          error={answer.error}
          title={answer.error && isApiError(answer.error) && answer.error.status === 400 ? 'Check the joint' : undefined}
          onRetry={() => void answer.refetch()}
        />
      ) : (
        <Results
          answer={answer.data}
          crewPage={crewPage}
          nearPage={nearPage}
          onCrewPage={(p) => go({}, { page: p, nearPage })}
          onNearPage={(p) => go({}, { page: crewPage, nearPage: p })}
        />
      )}
      <SafetyNotice className="mt-6" />
    </>
  );
}

function Results({
  answer,
  crewPage,
  nearPage,
  onCrewPage,
  onNearPage,
}: {
  answer: CrewFinderAnswer;
  crewPage: number;
  nearPage: number;
  onCrewPage: (p: number) => void;
  onNearPage: (p: number) => void;
}) {
  const th = 'px-3 py-2 text-left text-xs font-semibold uppercase tracking-wide text-stone-600';
  const td = 'px-3 py-2 align-top';
  return (
    <>
      <section aria-labelledby="crew-heading" className="mb-6">
        <h2 id="crew-heading" className="text-lg font-semibold text-stone-900">
          Crew — {answer.crew.total} {answer.crew.total === 1 ? 'welder' : 'welders'}
        </h2>
        <p className="mb-2 text-sm text-stone-600">
          {answer.asked.description}, {answer.asked.from} through {answer.asked.through}.
        </p>
        {answer.crew.total === 0 ? (
          <EmptyState title="No welder may weld this joint through that day">
            The near misses below show who is closest, and why.
          </EmptyState>
        ) : (
          <>
            <div className="overflow-x-auto rounded-lg border border-stone-200 bg-white">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Crew, longest in force first</caption>
                <thead className="bg-stone-50">
                  <tr>
                    <th scope="col" className={th}>Stamp</th>
                    <th scope="col" className={th}>Name</th>
                    <th scope="col" className={th}>Home shop</th>
                    <th scope="col" className={th}>Qualification</th>
                    <th scope="col" className={th}>In force until</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-stone-100">
                  {answer.crew.items.map((m) => (
                    <tr key={m.welder.id}>
                      <td className={`${td} font-semibold`}>
                        <Link className="text-accent-700 hover:underline" to={paths.welder.href(m.welder.id)}>{m.welder.stamp}</Link>
                      </td>
                      <td className={td}>{m.welder.name}</td>
                      <td className={td}>{m.welder.homeShop}</td>
                      <td className={td}>{m.qualification.number} · {m.qualification.codeName}</td>
                      <td className={td}>
                        {addDays(m.lapsesOn, -1)}
                        <span className="block text-xs text-stone-500">last use logged {m.lastEvidence}</span>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            <Pagination page={crewPage} pageSize={PAGE} total={answer.crew.total} noun="welders" onPageChange={onCrewPage} />
          </>
        )}
      </section>
      <section aria-labelledby="near-heading">
        <h2 id="near-heading" className="text-lg font-semibold text-stone-900">
          Near misses — {answer.nearMisses.total}
        </h2>
        <p className="mb-2 text-sm text-stone-600">Welders kept off the crew by one reason, closest first.</p>
        {answer.nearMisses.total === 0 ? (
          <p className="text-sm text-stone-600">None.</p>
        ) : (
          <>
            <div className="overflow-x-auto rounded-lg border border-stone-200 bg-white">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Near misses</caption>
                <thead className="bg-stone-50">
                  <tr>
                    <th scope="col" className={th}>Stamp</th>
                    <th scope="col" className={th}>Name</th>
                    <th scope="col" className={th}>Qualification</th>
                    <th scope="col" className={th}>Why not</th>
                    <th scope="col" className={th}>Clause</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-stone-100">
                  {answer.nearMisses.items.map((n) => (
                    <tr key={n.welder.id}>
                      <td className={`${td} font-semibold`}>
                        <Link className="text-accent-700 hover:underline" to={paths.welder.href(n.welder.id)}>{n.welder.stamp}</Link>
                      </td>
                      <td className={td}>{n.welder.name}</td>
                      <td className={td}>{n.qualification.number} · {n.qualification.codeName}</td>
                      <td className={td}>{n.reason.message}</td>
                      <td className={`${td} whitespace-nowrap`}>{n.reason.clause}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            <Pagination page={nearPage} pageSize={PAGE} total={answer.nearMisses.total} noun="near misses" onPageChange={onNearPage} />
          </>
        )}
      </section>
      <p className="mt-4 text-sm text-stone-700">{answer.notice}</p>
    </>
  );
}
