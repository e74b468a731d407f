// Lapses due in the next 90 days, per week: a bar chart for the eye and the same figures as a table for
// screen readers and for reading exact numbers.
// The chart library is large: it loads after the page has painted, into a box of fixed height.
import { lazy, Suspense } from 'react';

const LapsesBars = lazy(() => import('./lapses-bars'));

export function LapsesChart({ weeks }: { weeks: { weekStart: string; count: number }[] }) {
  const total = weeks.reduce((sum, w) => sum + w.count, 0);
  return (
    <div>
      <div className="h-56 w-full" aria-hidden="true">
        <Suspense fallback={null}>
          <LapsesBars weeks={weeks} />
        </Suspense>
      </div>
      <details className="mt-2 text-sm">
        <summary className="min-h-11 cursor-pointer py-2 font-semibold text-accent-700 sm:min-h-0">Show the figures as a table</summary>
        <table className="mt-1 w-full max-w-sm text-left">
          <caption className="sr-only">Lapses due by week, next 90 days ({total} in all)</caption>
          <thead>
            <tr>
              <th scope="col" className="py-1 pr-3">Week starting</th>
              <th scope="col" className="py-1 text-right">Lapses due</th>
            </tr>
          </thead>
          <tbody>
            {weeks.map((w) => (
              <tr key={w.weekStart} className="border-t border-stone-100">
                <td className="py-1 pr-3 tabular-nums">{w.weekStart}</td>
                <td className="py-1 text-right tabular-nums">{w.count}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
      <p className="sr-only">{total} qualifications lapse in the next 90 days unless use is logged.</p>
    </div>
  );
}
