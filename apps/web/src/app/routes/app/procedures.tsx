// Procedures: the company's WPS register. The QA manager adds, edits and supersedes; a foreman reads.
// Filters live in the URL so a view can be bookmarked.
import { processes, type Procedure } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ConfirmDialog, Dialog } from '@/components/ui/dialog';
import { SelectField, TextField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { procedureQueries, type ProcedureFilters } from '@/features/procedures/api/procedure-queries';
import { useUpdateProcedure } from '@/features/procedures/api/save-procedure';
import { PROCEDURE_CONFLICT_MESSAGE, ProcedureForm } from '@/features/procedures/components/procedure-form';
import { ProceduresTable } from '@/features/procedures/components/procedures-table';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { codeNames } from '@/lib/codes';

function useFilters() {
  const [params, setParams] = useSearchParams();
  const filters: ProcedureFilters = {
    code: (params.get('code') as ProcedureFilters['code']) || undefined,
    process: (params.get('process') as ProcedureFilters['process']) || undefined,
    status: (params.get('status') as ProcedureFilters['status']) || 'active',
    q: params.get('q') || undefined,
  };
  const update = (change: Partial<ProcedureFilters>) => {
    const next = { ...filters, ...change };
    const out = new URLSearchParams();
    if (next.code) out.set('code', next.code);
    if (next.process) out.set('process', next.process);
    if (next.status && next.status !== 'active') out.set('status', next.status);
    if (next.q) out.set('q', next.q);
    setParams(out, { replace: true });
  };
  return { filters, update };
}

function ProceduresScreen({ canEdit }: { canEdit: boolean }) {
  const { filters, update } = useFilters();
  const list = useQuery(procedureQueries.list(filters));
  const [editing, setEditing] = useState<Procedure | 'new' | null>(null);
  const [superseding, setSuperseding] = useState<Procedure | null>(null);
  const supersede = useUpdateProcedure({ successMessage: 'WPS superseded' });
  const [text, setText] = useState(filters.q ?? '');
  useEffect(() => {
    if (text.trim() === (filters.q ?? '')) return;
    const timer = setTimeout(() => update({ q: text.trim() || undefined }), 300);
    return () => clearTimeout(timer);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only a change of the typed text schedules a search
  }, [text]);

  const filtered = Boolean(filters.code || filters.process || filters.q || filters.status !== 'active');
  const supersedeError =
    supersede.error instanceof ApiError && supersede.error.status === 409 ? PROCEDURE_CONFLICT_MESSAGE : supersede.error ? errorMessage(supersede.error) : undefined;
  const closeSupersede = () => {
    setSuperseding(null);
    supersede.reset();
  };

  return (
    <>
      <PageHeader
        title="Procedures"
        description="The WPS register. A coupon must be welded to an active WPS of the same code and process."
        actions={
          canEdit && (
            <Button variant="primary" onClick={() => setEditing('new')}>
              <PlusIcon /> Add WPS
            </Button>
          )
        }
      />
      <div role="search" className="mb-3 grid gap-3 sm:grid-cols-4 lg:max-w-5xl">
        <TextField label="Search procedures" type="search" placeholder="Number or notes" value={text} onChange={(e) => setText(e.target.value)} autoComplete="off" />
        <SelectField label="Code" value={filters.code ?? ''} onChange={(e) => update({ code: (e.target.value || undefined) as ProcedureFilters['code'] })}>
          <option value="">All codes</option>
          {Object.entries(codeNames).map(([id, name]) => (
            <option key={id} value={id}>
              {name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Process" value={filters.process ?? ''} onChange={(e) => update({ process: (e.target.value || undefined) as ProcedureFilters['process'] })}>
          <option value="">All processes</option>
          {processes.map((p) => (
            <option key={p} value={p}>
              {p}
            </option>
          ))}
        </SelectField>
        <SelectField label="Status" value={filters.status} onChange={(e) => update({ status: e.target.value as ProcedureFilters['status'] })}>
          <option value="active">Active</option>
          <option value="superseded">Superseded</option>
          <option value="all">All</option>
        </SelectField>
      </div>
      {list.isPending ? (
        <LoadingState label="Loading the WPS register…" />
      ) : list.isError && !list.data ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : list.data.items.length === 0 && !filtered ? (
        <EmptyState
          title="The WPS register is empty"
          action={
            canEdit && (
              <Button variant="primary" onClick={() => setEditing('new')}>
                <PlusIcon /> Add the first WPS
              </Button>
            )
          }
        >
          {canEdit ? 'Add each WPS with its code, processes and ranges; attach the signed document.' : 'Your QA manager has not entered any WPS yet.'}
        </EmptyState>
      ) : (
        <ProceduresTable procedures={list.data.items} canEdit={canEdit} onEdit={setEditing} onSupersede={setSuperseding} empty="No WPS matches these filters." />
      )}

      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'Add a WPS' : editing ? `Edit ${editing.number} rev ${editing.revision}` : ''} size="lg">
        {editing !== null && (
          <ProcedureForm key={editing === 'new' ? 'new' : editing.id} procedure={editing === 'new' ? undefined : editing} onCancel={() => setEditing(null)} onDone={() => setEditing(null)} />
        )}
      </Dialog>
      <ConfirmDialog
        open={superseding !== null}
        title={superseding ? `Supersede ${superseding.number} rev ${superseding.revision}?` : ''}
        confirmLabel="Supersede"
        busy={supersede.isPending}
        error={supersedeError}
        onCancel={closeSupersede}
        onConfirm={() => superseding && supersede.mutate({ id: superseding.id, input: { status: 'superseded', version: superseding.version } }, { onSuccess: closeSupersede })}
      >
        New coupons can no longer be recorded against it. Coupons and qualifications already recorded keep it; the WPS stays in the register as superseded.
      </ConfirmDialog>
    </>
  );
}

export default function ProceduresRoute() {
  const me = useUser();
  return (
    <RequireRole roles={['qa_manager', 'foreman']} title="Procedures" message="The WPS register is for QA managers and foremen.">
      <ProceduresScreen canEdit={me.role === 'qa_manager'} />
    </RequireRole>
  );
}
