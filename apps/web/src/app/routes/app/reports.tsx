// Reports (QA manager): the audit report for a shop or the whole company and a period — its figures on
// screen, the full report as PDF (for the auditor) and CSV (for a spreadsheet).
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { type AuditReportQuery } from '@beadroll/rules';
import { buttonClasses } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { auditReportFile, reportQueries } from '@/features/reports/api/reports';

const iso = (d: Date) => d.toISOString().slice(0, 10);
function lastTwelveMonths(): AuditReportQuery {
  const to = new Date();
  const from = new Date(Date.UTC(to.getUTCFullYear(), to.getUTCMonth() - 11, 1));
  return { from: iso(from), to: iso(to) };
}

function Figures({ q }: { q: AuditReportQuery }) {
  const report = useQuery(reportQueries.audit(q));
  if (report.isPending) return <LoadingState label="Computing the report…" />;
  if (report.isError) return <ErrorState error={report.error} onRetry={() => void report.refetch()} />;
  const r = report.data;
  const s = r.summary;
  const figures: [string, string | number][] = [
    ['Welders', s.welders],
    [`Qualifications current on ${r.to}`, s.qualifications.current ?? 0],
    ['Lapsing', s.qualifications.lapsing ?? 0],
    ['Lapsed', s.qualifications.lapsed ?? 0],
    ['Revoked', s.qualifications.revoked ?? 0],
    ['Lapses in the period', s.lapses],
    ['Renewals', s.renewals],
    ['Revocations', s.revocations],
    ['Flagged use waiting / reviewed', `${s.flaggedUse.pending} / ${s.flaggedUse.reviewed}`],
    ['Lapse-watch notices sent', s.noticesSent],
  ];
  return (
    <section aria-label="Report figures" className="mt-4 rounded-lg border border-stone-200 bg-white p-4">
      <h2 className="text-lg font-bold">
        {r.shop ? `${r.shop.code} — ${r.shop.name}` : 'Every shop'}, {r.from} to {r.to}
      </h2>
      <dl className="mt-3 grid grid-cols-2 gap-x-6 gap-y-2 sm:grid-cols-5">
        {figures.map(([k, v]) => (
          <div key={k}>
            <dt className="text-sm text-stone-600">{k}</dt>
            <dd className="text-xl font-bold tabular-nums">{v}</dd>
          </div>
        ))}
      </dl>
      <div className="mt-4 flex flex-wrap gap-3">
        <a className={buttonClasses('primary')} href={auditReportFile(q, 'pdf')} download>Download the PDF</a>
        <a className={buttonClasses()} href={auditReportFile(q, 'csv')} download>Download the CSV</a>
      </div>
      <p className="mt-3 text-sm text-stone-600">
        The PDF holds the register with ranges and clauses, the continuity matrix (welder × process × month), lapses, renewals,
        revocations, flagged use and its dispositions, and the notices sent.
      </p>
    </section>
  );
}

export default function ReportsRoute() {
  const shops = useQuery(shopQueries.list());
  const [draft, setDraft] = useState<AuditReportQuery>(lastTwelveMonths);
  const [shown, setShown] = useState<AuditReportQuery | null>(null);
  return (
    <RequireRole roles={['qa_manager']} title="Reports">
      <PageHeader title="Reports" description="The audit report for a shop or the whole company over a period (at most 24 months)." />
      <form
        aria-label="Audit report"
        className="flex flex-wrap items-end gap-3 rounded-lg border border-stone-200 bg-white p-4"
        onSubmit={(e) => {
          e.preventDefault();
          setShown(draft);
        }}
      >
        <label className="flex flex-col text-sm font-semibold">
          Shop
          <select
            className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal"
            value={draft.shopId ?? ''}
            onChange={(e) => setDraft({ ...draft, shopId: e.target.value || undefined })}
          >
            <option value="">Every shop</option>
            {shops.data?.map((s) => (
              <option key={s.id} value={s.id}>{s.code} — {s.name}</option>
            ))}
          </select>
        </label>
        <label className="flex flex-col text-sm font-semibold">
          From
          <input className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal" type="date" required value={draft.from} onChange={(e) => setDraft({ ...draft, from: e.target.value })} />
        </label>
        <label className="flex flex-col text-sm font-semibold">
          To
          <input className="mt-1 rounded border border-stone-300 px-2 py-1.5 font-normal" type="date" required value={draft.to} onChange={(e) => setDraft({ ...draft, to: e.target.value })} />
        </label>
        <button className={buttonClasses('primary')} type="submit">Show the report</button>
      </form>
      {shown && <Figures q={shown} />}
      <div className="mt-4">
        <SafetyNotice />
      </div>
    </RequireRole>
  );
}
