// Your account: who you are signed in as, and every browser or device signed in with your account —
// end one you do not recognise, or all but this one.
import type { Session } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { Card, PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { sessionQueries, useEndSessions } from '@/features/account/api/session-queries';
import { errorMessage } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { formatInstant } from '@beadroll/rules';

function when(iso: string, timeZone: string): string {
  return formatInstant(iso, timeZone, 'long');
}

/** A short, human name for a browser's user-agent string. */
export function deviceName(userAgent: string): string {
  if (!userAgent) return 'Unknown browser';
  const browser =
    /Edg\//.test(userAgent) ? 'Edge' : /Firefox\//.test(userAgent) ? 'Firefox' : /Chrom(e|ium)\//.test(userAgent) ? 'Chrome' : /Safari\//.test(userAgent) ? 'Safari' : null;
  const system =
    /Android/.test(userAgent) ? 'Android' : /iPhone|iPad/.test(userAgent) ? 'iOS' : /Windows/.test(userAgent) ? 'Windows' : /Mac OS X/.test(userAgent) ? 'macOS' : /Linux/.test(userAgent) ? 'Linux' : null;
  if (browser && system) return `${browser} on ${system}`;
  return browser ?? system ?? userAgent.slice(0, 60);
}

type Pending = { kind: 'one'; session: Session } | { kind: 'others' } | null;

export default function AccountRoute() {
  const me = useUser();
  const sessions = useQuery(sessionQueries.list());
  const end = useEndSessions();
  const [pending, setPending] = useState<Pending>(null);
  const close = () => {
    setPending(null);
    end.reset();
  };
  const others = (sessions.data ?? []).filter((s) => !s.current);

  return (
    <>
      <PageHeader title="Your account" description={`${me.name} · ${me.email}`} />
      <Card>
        <section aria-labelledby="sessions-heading" className="space-y-3 p-4">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="sessions-heading" className="text-lg font-semibold text-stone-900">
              Signed-in browsers and devices
            </h2>
            {others.length > 0 && (
              <Button variant="danger" onClick={() => setPending({ kind: 'others' })}>
                Sign out everywhere else
              </Button>
            )}
          </div>
          <p className="text-sm text-stone-600">
            Each place you signed in stays signed in for 12 hours. Changing your password signs out all of them.
          </p>
          {sessions.isPending ? (
            <LoadingState label="Loading your sign-ins…" />
          ) : sessions.isError ? (
            <ErrorState error={sessions.error} onRetry={() => void sessions.refetch()} />
          ) : (
            <ul className="divide-y divide-stone-200 rounded-md ring-1 ring-stone-200">
              {sessions.data.map((s) => (
                <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                  <div>
                    <p className="font-semibold text-stone-900">
                      {deviceName(s.userAgent)}
                      {s.current && <span className="ml-2 text-sm font-normal text-accent-700">this browser</span>}
                    </p>
                    <p className="text-sm text-stone-600">
                      Signed in {when(s.createdAt, me.timeZone)} · last used {when(s.lastSeenAt, me.timeZone)}
                      {s.address ? ` · from ${s.address}` : ''}
                    </p>
                  </div>
                  {!s.current && (
                    <Button variant="ghost" size="row" onClick={() => setPending({ kind: 'one', session: s })} aria-label={`Sign out ${deviceName(s.userAgent)}, signed in ${when(s.createdAt, me.timeZone)}`}>
                      Sign out
                    </Button>
                  )}
                </li>
              ))}
            </ul>
          )}
        </section>
      </Card>
      <ConfirmDialog
        open={pending !== null}
        title={pending?.kind === 'others' ? 'Sign out everywhere else?' : 'Sign out this browser?'}
        confirmLabel="Sign out"
        busy={end.isPending}
        error={end.isError ? errorMessage(end.error) : undefined}
        onCancel={close}
        onConfirm={() => end.mutate(pending?.kind === 'one' ? pending.session.id : null, { onSuccess: close })}
      >
        {pending?.kind === 'others'
          ? `Every other browser and device signed in as you (${others.length}) will have to sign in again. This one stays signed in.`
          : pending?.kind === 'one'
            ? `${deviceName(pending.session.userAgent)}, signed in ${when(pending.session.createdAt, me.timeZone)}, will have to sign in again.`
            : null}
      </ConfirmDialog>
    </>
  );
}
