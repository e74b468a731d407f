// Continuity log (foreman, QA manager): the month of one shop as a grid of welders × processes, edited in
// place and saved in one go. Shop and month live in the URL; unsaved changes are marked and guarded.
import type { GridWelder } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useCallback, useEffect, useState } from 'react';
import { useBlocker, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { AlertIcon, InfoIcon, PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { continuityQueries } from '@/features/continuity/api/continuity-queries';
import { useSaveGrid } from '@/features/continuity/api/save-grid';
import { ContinuityGrid, type CellErrors } from '@/features/continuity/components/continuity-grid';
import {
  addWelder,
  cellErrors,
  changedCells,
  cellKey,
  draftFromGrid,
  fillDown,
  rebaseDraft,
  saveBody,
  setCell,
  takeTheirs,
  undatedCells,
  usesAfterLapse,
  type CellValue,
  type FillScope,
  type GridDraft,
} from '@/features/continuity/model/grid-draft';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { companyMonth } from '@/lib/company-day';

const isMonth = (m: string | null): m is string => Boolean(m && /^\d{4}-(0[1-9]|1[0-2])$/.test(m));

export default function ContinuityRoute() {
  return (
    <RequireRole roles={['qa_manager', 'foreman']} title="Continuity log" message="The continuity log is kept by foremen and the QA manager.">
      <ContinuityScreen />
    </RequireRole>
  );
}

function ContinuityScreen() {
  const [params, setParams] = useSearchParams();
  // The current month on the company's clock (Settings → time zone), not the browser's.
  const thisMonth = companyMonth(useUser().timeZone);
  const shops = useQuery(shopQueries.list());
  const activeShops = (shops.data ?? []).filter((s) => s.active);
  const shopId = params.get('shopId') ?? activeShops[0]?.id ?? '';
  const month = isMonth(params.get('month')) ? params.get('month')! : thisMonth;
  // Unsaved edits of the month on screen: changing shop or month asks before throwing them away.
  const [dirty, setDirty] = useState(false);
  const [pending, setPending] = useState<Record<string, string> | null>(null);
  const go = (changes: Record<string, string>) => setParams({ shopId, month, ...changes }, { replace: true });
  const choose = (changes: Record<string, string>) => (dirty ? setPending(changes) : go(changes));

  return (
    <>
      <PageHeader
        title="Continuity log"
        description="Tick each process a welder used this month and the job or traveler it was used on. One save records the whole month."
      />
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SelectField label="Shop" wrapperClassName="w-64" value={shopId} onChange={(e) => choose({ shopId: e.target.value })}>
          {activeShops.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name} ({s.code})
            </option>
          ))}
        </SelectField>
        <TextField
          label="Month"
          type="month"
          wrapperClassName="w-48"
          value={month}
          max={thisMonth}
          onChange={(e) => isMonth(e.target.value) && choose({ month: e.target.value })}
        />
      </div>
      {shops.isPending ? (
        <LoadingState label="Loading shops…" />
      ) : shops.isError ? (
        <ErrorState error={shops.error} onRetry={() => void shops.refetch()} />
      ) : !shopId ? (
        <EmptyState title="No shop to log for">You are not assigned to a shop yet. Ask the QA manager to assign you.</EmptyState>
      ) : (
        <MonthGrid key={`${shopId}:${month}`} shopId={shopId} month={month} onDirtyChange={setDirty} />
      )}
      <ConfirmDialog
        open={pending !== null}
        title="Discard unsaved changes?"
        confirmLabel="Discard and switch"
        onConfirm={() => {
          if (pending) go(pending);
          setPending(null);
          setDirty(false);
        }}
        onCancel={() => setPending(null)}
      >
        {`The ${month} log has changes that are not saved. Switching to another shop or month throws them away.`}
      </ConfirmDialog>
    </>
  );
}

function MonthGrid({ shopId, month, onDirtyChange }: { shopId: string; month: string; onDirtyChange: (dirty: boolean) => void }) {
  const me = useUser();
  const [conflicts, setConflicts] = useState<Record<string, string>>({});
  const [lateUse, setLateUse] = useState<ReturnType<typeof usesAfterLapse>>([]);
  const grid = useQuery(continuityQueries.grid(shopId, month));
  const [draft, setDraft] = useState<GridDraft | null>(null);
  const save = useSaveGrid();
  const [errors, setErrors] = useState<CellErrors>({});
  const [formError, setFormError] = useState<string>();
  const [saved, setSaved] = useState(false);

  useEffect(() => {
    if (grid.data && !draft) setDraft(draftFromGrid(grid.data));
  }, [grid.data, draft]);

  const changes = draft ? changedCells(draft).length : 0;
  const dirty = changes > 0;
  useEffect(() => onDirtyChange(dirty), [dirty, onDirtyChange]);
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    if (!dirty) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [dirty]);

  const onCell = useCallback((welderId: string, process: string, patch: Partial<CellValue>) => {
    setSaved(false);
    setDraft((d) => (d ? setCell(d, welderId, process, patch) : d));
  }, []);
  const onFill = useCallback((process: string, scope: FillScope, jobReference?: string, usedOn?: string) => {
    setSaved(false);
    setDraft((d) => (d ? fillDown(d, process, scope, jobReference, usedOn) : d));
  }, []);
  const onTakeTheirs = useCallback((welderId: string, process: string) => {
    setDraft((d) => (d ? takeTheirs(d, welderId, process) : d));
    setConflicts(({ [cellKey(welderId, process)]: _gone, ...rest }) => rest);
  }, []);

  if (grid.isPending || (grid.data && !draft)) return <LoadingState label="Loading the month…" />;
  if (grid.isError) return <ErrorState error={grid.error} onRetry={() => void grid.refetch()} />;
  if (!draft) return null;

  const readOnly = draft.closed && me.role !== 'qa_manager';
  const send = () => {
    const body = saveBody(draft);
    setErrors({});
    setFormError(undefined);
    setLateUse([]);
    save.mutate(body, {
      onSuccess: (next) => {
        setDraft(draftFromGrid(next));
        setConflicts({});
        setSaved(true);
      },
      onError: (error) => {
        if (isApiError(error) && error.status === 409 && Object.keys(error.fields).length) {
          // Someone else changed some of these cells: show their values with the user's edits laid over
          // them (on the current versions), name whose change won, and let the user reapply or keep theirs.
          const mapped = cellErrors(body, error.fields);
          setConflicts(Object.fromEntries(Object.entries(mapped.byCell).map(([k, v]) => [k, Object.values(v).join(' · ')])));
          setFormError(error.message);
          void grid.refetch().then((fresh) => {
            if (fresh.data) setDraft((mine) => (mine ? rebaseDraft(draftFromGrid(fresh.data), mine) : mine));
          });
        } else if (isApiError(error) && error.status === 400 && Object.keys(error.fields).length) {
          const mapped = cellErrors(body, error.fields);
          setErrors(mapped.byCell);
          setFormError(mapped.other.length ? mapped.other.join(' · ') : 'Some cells need attention: see the messages in the grid.');
        } else setFormError(isApiError(error) ? error.message : 'The month could not be saved.');
      },
    });
  };
  const submit = () => {
    // Every ticked cell needs its day of use: the grid never makes one up.
    const undated = undatedCells(draft);
    if (undated.length) {
      setErrors(Object.fromEntries(undated.map((k) => [k, { usedOn: 'Enter the day of use' }])));
      setFormError(`Enter the day of use for ${undated.length} ticked ${undated.length === 1 ? 'cell' : 'cells'}.`);
      return;
    }
    const late = usesAfterLapse(draft);
    if (late.length) setLateUse(late);
    else send();
  };

  return (
    <div className="space-y-3">
      {draft.closed && (
        <p className="flex items-start gap-2 rounded-md border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-900" role="note">
          <InfoIcon className="mt-0.5 size-4 shrink-0" />
          {readOnly
            ? 'This month is closed: only the QA manager can change it now. Ask them if something is missing.'
            : 'This month is closed to foremen. As QA manager you can still correct it; every change is audited.'}
        </p>
      )}
      <AddWelder shopId={shopId} draft={draft} disabled={readOnly} onAdd={(w) => setDraft((d) => (d ? addWelder(d, w) : d))} />
      {draft.rows.length === 0 ? (
        <EmptyState title="No welders in this shop">Add a welder who worked here by stamp or name.</EmptyState>
      ) : (
        <ContinuityGrid
          draft={draft}
          readOnly={readOnly}
          errors={errors}
          conflicts={conflicts}
          onCell={onCell}
          onFill={onFill}
          onTakeTheirs={onTakeTheirs}
        />
      )}
      <FormError message={formError} />
      {!readOnly && (
        <div className="sticky bottom-0 flex flex-wrap items-center gap-3 border-t border-stone-200 bg-white/95 py-3">
          <Button variant="primary" onClick={submit} busy={save.isPending} disabled={!dirty}>
            Save month
          </Button>
          <span role="status" className="text-sm">
            {dirty ? (
              <span className="inline-flex items-center gap-1 font-semibold text-amber-800">
                <AlertIcon className="size-4" /> Unsaved changes ({changes} {changes === 1 ? 'cell' : 'cells'})
              </span>
            ) : saved ? (
              <span className="font-semibold text-emerald-800">Month saved. Statuses are up to date.</span>
            ) : (
              <span className="text-stone-600">All changes saved</span>
            )}
          </span>
        </div>
      )}
      <ConfirmDialog
        open={lateUse.length > 0}
        title="Save use after a lapse or revocation?"
        confirmLabel="Save and flag for review"
        tone="primary"
        onConfirm={send}
        onCancel={() => setLateUse([])}
      >
        {`${lateUse
          .map((u) => `${u.stamp} ${u.process} on ${u.usedOn} (${u.codes.map((c) => `${c.label} ${c.kind === 'revoked' ? `revoked ${c.revokedOn ?? ''}` : `lapsed ${c.lapsesOn}`}`).join(', ')})`)
          .join('; ')}. Use on or after a lapse or revocation does not keep a qualification in force: it is saved, flagged for the QA manager's review, and only a renewal test brings the qualification back.`}
      </ConfirmDialog>
      <ConfirmDialog
        open={blocker.state === 'blocked'}
        title="Leave without saving?"
        confirmLabel="Leave and discard"
        onConfirm={() => blocker.proceed?.()}
        onCancel={() => blocker.reset?.()}
      >
        This month has unsaved changes. They are lost if you leave now.
      </ConfirmDialog>
    </div>
  );
}

function AddWelder({ shopId, draft, disabled, onAdd }: { shopId: string; draft: GridDraft; disabled: boolean; onAdd: (welder: GridWelder) => void }) {
  const [text, setText] = useState('');
  const [q, setQ] = useState('');
  useEffect(() => {
    const timer = setTimeout(() => setQ(text.trim()), 300);
    return () => clearTimeout(timer);
  }, [text]);
  const found = useQuery({ ...continuityQueries.addable(shopId, q), enabled: q.length > 0 });
  const options = (found.data ?? []).filter((w) => !draft.rows.some((r) => r.welder.id === w.id));
  if (disabled) return null;
  return (
    <div className="max-w-xl">
      <TextField label="Add a welder from another shop" placeholder="Stamp or name" value={text} onChange={(e) => setText(e.target.value)} />
      {q && found.data && (
        <ul className="mt-1 divide-y divide-stone-100 rounded-md border border-stone-200 bg-white" aria-label="Welders found">
          {options.length === 0 ? (
            <li className="px-3 py-2 text-sm text-stone-600">No welder to add matches “{q}”.</li>
          ) : (
            options.slice(0, 8).map((w) => (
              <li key={w.id} className="flex items-center justify-between gap-2 px-3 py-1">
                <span className="text-sm">
                  <span className="font-mono font-semibold">{w.stamp}</span> {w.name}
                  {w.homeShop ? <span className="text-stone-500"> · {w.homeShop.name}</span> : null}
                </span>
                <Button
                  size="row"
                  onClick={() => {
                    onAdd(w);
                    setText('');
                  }}
                  aria-label={`Add ${w.stamp}`}
                >
                  <PlusIcon /> Add
                </Button>
              </li>
            ))
          )}
        </ul>
      )}
    </div>
  );
}
