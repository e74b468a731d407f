// Imports (QA manager): choose what the file holds, upload it, map its columns to ours, check it (dry
// run: nothing is written), read the report, then commit — all or nothing — with a progress bar and a cancel.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import {
  availableImportKinds,
  importDateFormatNames,
  importDateFormats,
  type Import,
  type ImportDateFormat,
  type ImportMapping,
} from '@beadroll/rules';
import { Button } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/ui/states';
import { errorMessage } from '@/lib/api-client';
import { cancelImport, checkImport, commitImport, importQueries, paperRecordQueries, uploadImport } from '@/features/imports/api/imports';
import { PaperRecordDifferences } from '@/features/imports/components/paper-records';

const kindNames: Record<(typeof availableImportKinds)[number], string> = {
  welders: 'Welders (stamp, name, home shop, e-mail)',
  qualifications: 'Existing qualifications (paper WPQs: stamp, code, process, test date, the coupon’s variables)',
  continuity: 'Continuity history (stamp, process, date or month, job)',
};

function Report({ imp }: { imp: Import }) {
  const r = imp.report;
  if (!r) return null;
  return (
    <section aria-label="Check report" className="mt-4 rounded-lg border border-stone-200 bg-white p-4">
      <h2 className="text-lg font-bold">Check report</h2>
      <p className="mt-1" role="status">
        {r.rows} rows: <strong>{r.new} new</strong>, {r.changed} changed, {r.unchanged} unchanged
        {r.errors > 0 && (
          <>
            , <strong className="text-red-800">{r.errors} with problems</strong>
          </>
        )}
        .
      </p>
      {r.notes.map((n) => (
        <p key={n} className="mt-1 text-sm text-stone-700">{n}</p>
      ))}
      {r.issues.length > 0 && (
        <table className="mt-3 w-full text-sm">
          <caption className="text-left font-semibold">Fix these rows in the file, upload it again and check</caption>
          <thead>
            <tr className="text-left">
              <th className="py-1 pr-3">Row</th>
              <th className="py-1 pr-3">Column</th>
              <th className="py-1">Problem</th>
            </tr>
          </thead>
          <tbody>
            {r.issues.map((i, k) => (
              <tr key={k} className="border-t border-stone-100">
                <td className="py-1 pr-3 tabular-nums">{i.row}</td>
                <td className="py-1 pr-3">{i.column ?? '—'}</td>
                <td className="py-1">{i.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {r.changes.length > 0 && (
        <details className="mt-3 text-sm">
          <summary className="cursor-pointer font-semibold">What would change ({r.changed})</summary>
          <ul className="mt-1">
            {r.changes.map((c) => (
              <li key={`${c.row}-${c.key}`}>
                Row {c.row}, {c.key}:{' '}
                {Object.keys(c.after)
                  .filter((k) => c.before[k] !== c.after[k])
                  .map((k) => `${k} ${c.before[k] || '(blank)'} → ${c.after[k] || '(blank)'}`)
                  .join('; ')}
              </li>
            ))}
          </ul>
        </details>
      )}
    </section>
  );
}

function Progress({ imp }: { imp: Import }) {
  const { done, total, phase } = imp.progress;
  const pct = total > 0 ? Math.round((done / total) * 100) : 0;
  return (
    <div className="mt-4">
      <p className="text-sm">{phase || 'starting'}… {done.toLocaleString()} of {total.toLocaleString()}</p>
      <progress className="h-3 w-full" max={100} value={pct} aria-label="Import progress">{pct}%</progress>
    </div>
  );
}

export default function ImportsRoute() {
  const queryClient = useQueryClient();
  const [kind, setKind] = useState<(typeof availableImportKinds)[number]>('welders');
  const [file, setFile] = useState<File | null>(null);
  const [id, setId] = useState<string | null>(null);
  const [mapping, setMapping] = useState<ImportMapping>({});
  const [dateFormat, setDateFormat] = useState<ImportDateFormat | ''>('');
  const current = useQuery({ ...importQueries.detail(id ?? ''), enabled: id !== null });
  const imp = current.data;

  const setData = (v: Import) => queryClient.setQueryData(importQueries.detail(v.id).queryKey, v);
  const upload = useMutation({
    mutationFn: () => uploadImport(kind, file!),
    onSuccess: (v) => {
      setData(v);
      setId(v.id);
      setMapping(v.mapping);
      setDateFormat(v.dateFormat ?? '');
    },
  });
  const check = useMutation({
    mutationFn: () => checkImport(id!, { mapping, dateFormat: dateFormat as ImportDateFormat }),
    onSuccess: setData,
  });
  const commit = useMutation({ mutationFn: () => commitImport(id!), onSuccess: setData });
  // A committed qualifications import may bring paper records to settle.
  const committed = imp?.status === 'committed';
  useEffect(() => {
    if (committed) void queryClient.invalidateQueries({ queryKey: paperRecordQueries.all() });
  }, [committed, queryClient]);
  const cancel = useMutation({ mutationFn: () => cancelImport(id!), onSuccess: setData });

  return (
    <div>
      <PageHeader
        title="Imports"
        description="Bring records in from a spreadsheet (.csv or .xlsx). Nothing is written until you commit a checked file, and a commit is all or nothing."
      />
      <form
        className="flex flex-wrap items-end gap-3 rounded-lg border border-stone-200 bg-white p-4"
        onSubmit={(e) => {
          e.preventDefault();
          if (file) upload.mutate();
        }}
      >
        <label className="flex flex-col text-sm font-semibold">
          What the file holds
          <select className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
            {availableImportKinds.map((k) => (
              <option key={k} value={k}>{kindNames[k]}</option>
            ))}
          </select>
        </label>
        <label className="flex flex-col text-sm font-semibold">
          File
          <input className="mt-1 font-normal" type="file" accept=".csv,.xlsx,text/csv" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
        </label>
        <Button type="submit" variant="primary" busy={upload.isPending} disabled={!file}>Upload</Button>
        <p className="w-full text-sm text-stone-600">Production welds cannot be imported yet.</p>
        {upload.isError && <p role="alert" className="w-full text-sm text-red-800">{errorMessage(upload.error)}</p>}
      </form>

      {current.isError && <ErrorState error={current.error} />}
      {imp && (
        <section aria-label="Columns" className="mt-4 rounded-lg border border-stone-200 bg-white p-4">
          <h2 className="text-lg font-bold">Columns of {imp.fileName}</h2>
          <p className="text-sm text-stone-600">Say which of your columns holds each field. Your choice is remembered for the next file.</p>
          <div className="mt-3 grid gap-3 sm:grid-cols-2">
            {imp.fields.map((f) => (
              <label key={f.key} className="flex flex-col text-sm font-semibold">
                {f.label}{f.required ? ' (required)' : ''}
                <select
                  className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal"
                  value={mapping[f.key] ?? ''}
                  disabled={imp.status === 'running' || imp.status === 'committed'}
                  onChange={(e) => setMapping({ ...mapping, [f.key]: e.target.value || null })}
                >
                  <option value="">— not in this file —</option>
                  {imp.headers.map((h) => (
                    <option key={h} value={h}>{h}</option>
                  ))}
                </select>
                <span className="font-normal text-stone-600">{f.hint}</span>
              </label>
            ))}
            <label className="flex flex-col text-sm font-semibold">
              How the file writes dates
              <select
                className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal"
                value={dateFormat}
                onChange={(e) => setDateFormat(e.target.value as ImportDateFormat | '')}
              >
                <option value="">— choose —</option>
                {importDateFormats.map((d) => (
                  <option key={d} value={d}>{importDateFormatNames[d]}</option>
                ))}
              </select>
              <span className="font-normal text-stone-600">Dates stored as dates in an .xlsx are read as they are.</span>
            </label>
          </div>
          <div className="mt-4 flex flex-wrap gap-3">
            <Button
              variant="primary"
              busy={check.isPending}
              disabled={!dateFormat || imp.status === 'running' || imp.status === 'committed'}
              onClick={() => check.mutate()}
            >
              Check the file
            </Button>
            <Button
              variant="primary"
              busy={commit.isPending}
              disabled={imp.status !== 'checked' || (imp.report?.errors ?? 1) > 0}
              onClick={() => {
                if (window.confirm(`Write ${imp.report?.new ?? 0} new and ${imp.report?.changed ?? 0} changed records?`)) commit.mutate();
              }}
            >
              Commit
            </Button>
            {imp.status === 'running' && (
              <Button busy={cancel.isPending} onClick={() => cancel.mutate()}>Cancel the import</Button>
            )}
          </div>
          {[check, commit, cancel].map((m, k) => m.isError && <p key={k} role="alert" className="mt-2 text-sm text-red-800">{errorMessage(m.error)}</p>)}
          {imp.status === 'running' && <Progress imp={imp} />}
          {imp.status === 'committed' && <p role="status" className="mt-3 font-semibold text-emerald-800">Committed: the records are in the registry.</p>}
          {(imp.status === 'cancelled' || imp.status === 'failed') && <p role="alert" className="mt-3 text-red-800">{imp.error}</p>}
          <Report imp={imp} />
        </section>
      )}
      <PaperRecordDifferences />
    </div>
  );
}
