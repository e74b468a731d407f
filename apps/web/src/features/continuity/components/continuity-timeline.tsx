// A welder's continuity per process: the state today, the last logged use, and (on the welder file) the
// whole history: tests, logged use, lapses, renewals, flags and revocation, oldest first.
import { displayName, formatDay, type Timeline } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { daysText } from '@/components/ui/qualification-chip';
import { Card } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useUser } from '@/lib/auth';
import { companyToday } from '@/lib/company-day';
import { continuityQueries } from '../api/continuity-queries';

type TimelineProcess = Timeline['processes'][number];
const kindWords = { test: 'Test', use: 'Used', lapse: 'Lapsed', renewal: 'Renewed', flag: 'Flag', revocation: 'Revoked' } as const;
const kindTone = {
  test: 'text-accent-800',
  use: 'text-stone-800',
  lapse: 'text-red-800',
  renewal: 'text-emerald-800',
  flag: 'text-amber-900',
  revocation: 'text-red-800',
} as const;
const stateKey = (s: string) =>
  (['current', 'lapsing', 'lapsed', 'revoked'].includes(s) ? `qualification.${s}` : 'qualification.current') as
    | 'qualification.current'
    | 'qualification.lapsing'
    | 'qualification.lapsed'
    | 'qualification.revoked';

export function lastUse(p: TimelineProcess): string | null {
  return p.events.filter((e) => e.kind === 'use').reduce<string | null>((a, e) => (!a || e.date > a ? e.date : a), null);
}

export function daysLeftOf(p: TimelineProcess, today: string): number | null {
  if (!p.lapsesOn) return null;
  return Math.round((Date.parse(p.lapsesOn) - Date.parse(today)) / 86_400_000);
}

export function ContinuitySummary({ welderId, full = false }: { welderId: string; full?: boolean }) {
  const timeline = useQuery(continuityQueries.timeline(welderId));
  const today = companyToday(useUser().timeZone);
  if (timeline.isPending) return <LoadingState label="Loading continuity…" />;
  if (timeline.isError) return <ErrorState error={timeline.error} onRetry={() => void timeline.refetch()} />;
  if (timeline.data.processes.length === 0) return <Card className="p-4 text-sm text-stone-600">No continuity on record yet.</Card>;
  return (
    <div className="space-y-3">
      {timeline.data.processes.map((p) => {
        const days = daysLeftOf(p, today);
        const last = lastUse(p);
        return (
          <Card key={`${p.process}:${p.code}`} className="p-4" >
            <div className="flex flex-wrap items-center gap-x-3 gap-y-1" data-process={p.process}>
              <h3 className="font-bold">
                {p.process} <span className="text-sm font-normal text-stone-500">{displayName('codes', p.code)}</span>
              </h3>
              <StatusChip status={stateKey(p.state)} />
              {p.state !== 'revoked' && days !== null && (
                <span className="text-sm text-stone-700">
                  {daysText(days)}
                  {p.lapsesOn ? ` · ${days > 0 ? 'lapses on' : 'since'} ${formatDay(p.lapsesOn, 'long')}` : ''}
                </span>
              )}
              <span className="text-sm text-stone-700">Last logged use: {last ?? 'none yet'}</span>
            </div>
            {full && (
              <ol className="mt-3 space-y-1 border-l-2 border-stone-200 pl-3 text-sm" aria-label={`${p.process} timeline`}>
                {p.events.map((e, i) => (
                  <li key={`${e.date}:${e.kind}:${i}`} className="flex gap-2">
                    <span className="w-24 shrink-0 tabular-nums text-stone-500">{e.date}</span>
                    <span className={`w-20 shrink-0 font-semibold ${kindTone[e.kind]}`}>{kindWords[e.kind]}</span>
                    <span className="text-stone-700">{e.detail}</span>
                  </li>
                ))}
              </ol>
            )}
          </Card>
        );
      })}
      <p className="text-xs text-stone-500">
        Continuity follows the code edition in force (e.g. ASME IX QW-322); the company&apos;s quality manual and the responsible inspector govern.
      </p>
    </div>
  );
}
