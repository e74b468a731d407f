// The QA manager's control of a welder's public verify link: whether one is active, issue or reissue
// it (the old link and every card printed with it stop working, named in the warning) and revoke it. The
// panel reads the server's state each time: downloading a card or WPQ never issues a link.
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { errorMessage } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { formatInstantDay } from '@beadroll/rules';
import { useIssueVerifyToken, useRevokeVerifyToken, verifyQueries } from '../api/verify-queries';

export function VerifyLinkPanel({ welderId, welderName }: { welderId: string; welderName: string }) {
  const me = useUser();
  const status = useQuery(verifyQueries.tokenStatus(welderId));
  const issue = useIssueVerifyToken();
  const revoke = useRevokeVerifyToken();
  const [confirm, setConfirm] = useState<'issue' | 'revoke' | null>(null);
  const close = () => {
    setConfirm(null);
    issue.reset();
    revoke.reset();
  };

  if (status.isPending) return <LoadingState label="Checking the verify link…" />;
  if (status.isError) return <ErrorState error={status.error} onRetry={() => void status.refetch()} />;
  const { active, issuedAt, url, printedOn } = status.data;
  const since = issuedAt ? formatInstantDay(issuedAt, me.timeZone, 'long') : null;
  // What a reissue or a revocation kills, named: every copy of these printed since the link was issued.
  const killed = (
    <>
      The QR code and link stop working at once on every copy printed since {since ?? 'the link was issued'} of:
      <ul className="mt-1 list-disc pl-5" data-testid="verify-killed-documents">
        {printedOn.map((d) => (
          <li key={d}>{d}</li>
        ))}
      </ul>
      Print them again afterwards.
    </>
  );

  return (
    <div data-testid="verify-link-state" data-active={active}>
      {active ? (
        <>
          <p className="text-sm text-stone-700">
            A verify link is active, issued {since}. The wallet card prints it as a QR code and each WPQ record
            prints it in its footer.
          </p>
          {url ? (
            <p className="mt-2 break-all rounded-md bg-accent-50 px-3 py-2 text-sm">
              Verify link:{' '}
              <a href={url} className="font-semibold text-accent-700 underline" data-testid="verify-url" target="_blank" rel="noreferrer">
                {url}
              </a>
            </p>
          ) : (
            <p className="mt-2 text-sm text-stone-700">
              The link cannot be shown with this server&rsquo;s secret, so cards and WPQs print without it. Reissue it
              to print working cards.
            </p>
          )}
        </>
      ) : (
        <p className="text-sm text-stone-700">
          No verify link is active: a wallet card or WPQ downloaded now prints without a QR code, and an inspector
          scanning an older card sees that it is no longer valid.
        </p>
      )}
      <div className="mt-2 flex flex-wrap gap-2">
        <Button onClick={() => setConfirm('issue')}>{active ? 'Reissue verify link' : 'Issue verify link'}</Button>
        {active && (
          <Button variant="ghost" onClick={() => setConfirm('revoke')}>
            Revoke verify link
          </Button>
        )}
      </div>
      <ConfirmDialog
        open={confirm === 'issue'}
        title={active ? `Reissue ${welderName}'s verify link?` : `Issue a verify link for ${welderName}?`}
        confirmLabel={active ? 'Reissue link' : 'Issue link'}
        tone={active ? 'danger' : 'primary'}
        busy={issue.isPending}
        error={issue.error ? errorMessage(issue.error) : undefined}
        onCancel={close}
        onConfirm={() => issue.mutate(welderId, { onSuccess: close })}
      >
        {active ? killed : 'Anyone with the link sees the name, stamp and status of each qualification today. Cards and WPQs downloaded afterwards print it.'}
      </ConfirmDialog>
      <ConfirmDialog
        open={confirm === 'revoke'}
        title={`Revoke ${welderName}'s verify link?`}
        confirmLabel="Revoke link"
        busy={revoke.isPending}
        error={revoke.error ? errorMessage(revoke.error) : undefined}
        onCancel={close}
        onConfirm={() => revoke.mutate(welderId, { onSuccess: close })}
      >
        {killed}
      </ConfirmDialog>
    </div>
  );
}
