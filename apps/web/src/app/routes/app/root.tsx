// The signed-in shell: brand, the role's navigation, who is signed in, sign-out, and the standing
// caution that Beadroll's results support and do not replace the code, the quality manual and the inspector.
import type { Me } from '@beadroll/rules';
import { Suspense, type ReactNode } from 'react';
import { Link, NavLink, Outlet, useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { BeadIcon } from '@/components/ui/icons';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { roleLabels, useLogout, useUser } from '@/lib/auth';
import RouteError from './route-error';

interface NavItem {
  label: string;
  to: string;
  end?: boolean;
}

/** The screens each role has today (DESIGN.md names); later issues add theirs as they arrive. */
export function navigationFor(me: Me): NavItem[] {
  switch (me.role) {
    case 'qa_manager':
      return [
        { label: 'Overview', to: paths.overview.href(), end: true },
        { label: 'Welders', to: paths.welders.href() },
        { label: 'Continuity log', to: paths.continuity.href() },
        { label: 'Weld log', to: paths.welds.href() },
        { label: 'Crew finder', to: paths.crewFinder.href() },
        { label: 'Coupons', to: paths.coupons.href() },
        { label: 'Procedures', to: paths.procedures.href() },
        { label: 'Shops', to: paths.shops.href() },
        { label: 'People', to: paths.people.href() },
        { label: 'Lapse watch', to: paths.lapseWatch.href() },
        { label: 'Reports', to: paths.reports.href() },
        { label: 'Imports', to: paths.imports.href() },
        { label: 'Settings', to: paths.settings.href() },
        { label: 'API tokens', to: paths.apiTokens.href() },
        { label: 'Audit trail', to: paths.audit.href() },
      ];
    case 'foreman':
      return [
        { label: 'Overview', to: paths.overview.href(), end: true },
        { label: 'Welders', to: paths.welders.href() },
        { label: 'Continuity log', to: paths.continuity.href() },
        { label: 'Weld log', to: paths.welds.href() },
        { label: 'Crew finder', to: paths.crewFinder.href() },
        { label: 'Procedures', to: paths.procedures.href() },
      ];
    case 'welder':
      return [
        { label: 'My qualifications', to: paths.myQualifications.href() },
        ...(me.welderId ? [{ label: 'Welder file', to: paths.welder.href(me.welderId) }] : []),
      ];
  }
}

function navClass({ isActive }: { isActive: boolean }): string {
  return `inline-flex min-h-11 shrink-0 items-center rounded-md px-3 text-base font-semibold sm:min-h-9 sm:text-sm ${
    isActive ? 'bg-accent-600 text-white' : 'text-stone-700 hover:bg-stone-200/70 hover:text-stone-900'
  }`;
}

function Shell({ children }: { children: ReactNode }) {
  const me = useUser();
  const logout = useLogout();
  const navigate = useNavigate();
  const signOut = () =>
    logout.mutate(undefined, {
      onSettled: () => {
        void navigate(paths.signIn.href(), { replace: true });
      },
    });

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="border-b border-stone-200 bg-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2 sm:px-6">
          <Link to="/" className="flex items-center gap-2 py-1 text-lg font-bold text-stone-900">
            <span className="grid size-8 place-items-center rounded-md bg-accent-600 text-white">
              <BeadIcon className="size-5" />
            </span>
            Beadroll
          </Link>
          <nav aria-label="Main" className="order-last -mx-1 flex w-full gap-1 overflow-x-auto pb-1 md:order-none md:w-auto md:pb-0">
            {navigationFor(me).map((item) => (
              <NavLink key={item.to} to={item.to} end={item.end} className={navClass}>
                {item.label}
              </NavLink>
            ))}
          </nav>
          <div className="ml-auto flex items-center gap-3">
            <div className="text-right leading-tight">
              <Link to={paths.account.href()} className="text-sm font-semibold text-stone-900 hover:underline" title="Your account and signed-in devices">
                {me.name}
              </Link>
              <p className="text-xs text-stone-500">
                {roleLabels[me.role]} · {me.organization.name}
              </p>
            </div>
            <Button onClick={signOut} busy={logout.isPending}>
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-5 sm:px-6">
        {children}
      </main>
      <footer className="border-t border-stone-200 bg-white">
        <div className="mx-auto max-w-7xl px-4 py-3 sm:px-6">
          <SafetyNotice />
        </div>
      </footer>
    </div>
  );
}

export default function AppRoot() {
  return (
    <Shell>
      <Suspense fallback={<LoadingState />}>
        <Outlet />
      </Suspense>
    </Shell>
  );
}

/** The signed-in part could not start at all (a 5xx from /api/me); there is no shell to show it in. */
export function RootErrorBoundary() {
  return (
    <div className="mx-auto max-w-2xl px-4 py-10">
      <RouteError />
      <p className="mt-4 text-sm">
        <a href="/" className="font-semibold text-accent-700 underline">
          Back to Beadroll
        </a>
      </p>
    </div>
  );
}
