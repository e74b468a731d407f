import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { InfoIcon } from '@/components/ui/icons';
import { paths } from '@/config/paths';

/** The frame of the development tools: plainly marked as such, outside the signed-in shell. */
export function DevLayout({ children }: { children: ReactNode }) {
  return (
    <div className="min-h-dvh bg-stone-50">
      <header className="border-b border-amber-200 bg-amber-50">
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-x-4 gap-y-1 px-4 py-2 text-sm text-amber-950">
          <InfoIcon className="size-5 shrink-0" />
          <p className="flex-1">
            <strong>Development mail.</strong> Messages caught by the local mail catcher; this page does not exist in production.
          </p>
          <Link to={paths.devMail.href()} className="font-semibold underline">
            Inbox
          </Link>
          <Link to={paths.signIn.href()} className="font-semibold underline">
            Sign in
          </Link>
        </div>
      </header>
      <main className="mx-auto max-w-5xl px-4 py-5">{children}</main>
    </div>
  );
}
