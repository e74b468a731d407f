import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { BeadIcon } from '@/components/ui/icons';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { paths } from '@/config/paths';
import { mailQueries } from '@/features/dev-mail/api/mail-queries';

/** The frame of the signed-out pages: brand, one card, and the standing caution. */
export function AuthLayout({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  const devMail = useQuery(mailQueries.available());
  return (
    <div className="flex min-h-dvh flex-col bg-stone-100">
      <main className="flex flex-1 items-start justify-center px-4 pt-[8vh] pb-10">
        <div className="w-full max-w-sm">
          <div className="mb-6 flex items-center gap-2 text-xl font-bold text-stone-900">
            <span className="grid size-9 place-items-center rounded-md bg-accent-600 text-white">
              <BeadIcon className="size-6" />
            </span>
            Beadroll
          </div>
          <div className="rounded-lg border border-stone-200 bg-white p-6 shadow-sm">
            <h1 className="text-xl font-bold text-stone-900">{title}</h1>
            {intro && <div className="mt-1 text-sm text-stone-600">{intro}</div>}
            <div className="mt-5">{children}</div>
          </div>
          <p className="mt-4 text-sm text-stone-600">
            Welder performance qualifications and continuity, across every shop of your company.
          </p>
        </div>
      </main>
      <footer className="border-t border-stone-200 bg-white">
        <div className="mx-auto flex max-w-5xl flex-col gap-2 px-4 py-3 sm:flex-row sm:items-center sm:justify-between">
          <SafetyNotice />
          {devMail.data && (
            <Link to={paths.devMail.href()} className="shrink-0 text-xs font-semibold text-accent-700 underline">
              Development mail
            </Link>
          )}
        </div>
      </footer>
    </div>
  );
}
