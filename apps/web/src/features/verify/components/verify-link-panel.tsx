// The QA manager's control of a welder's public verify link: whether one is active, issue or reissue
// it (the old link and every card printed with it stop working) and revoke it. A new link is shown once.
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { errorMessage } from '@/lib/api-client';
import { useIssueVerifyToken, useRevokeVerifyToken, verifyQueries } from '../api/verify-queries';

export function VerifyLinkPanel({ welderId, welderName }: { welderId: string; welderName: string }) {
  const status = useQuery(verifyQueries.tokenStatus(welderId));
  const issue = useIssueVerifyToken();
  const revoke = useRevokeVerifyToken();
  const [confirm, setConfirm] = useState<'issue' | 'revoke' | null>(null);
  const [url, setUrl] = useState<string | null>(null);
  const close = () => {
    setConfirm(null);
    issue.reset();
    revoke.reset();
  };

  if (status.isPending) return <LoadingState label="Checking the verify link…" />;
  if (status.isError) return <ErrorState error={status.error} onRetry={() => void status.refetch()} />;
  const active = status.data.active;

  return (
    <div>
      <p className="text-sm text-stone-700">
        {active
          ? `A verify link is active${status.data.issuedAt ? ` (issued ${new Date(status.data.issuedAt).toLocaleDateString('en-CA')})` : ''}. It is printed as a QR code on the wallet card.`
          : 'No verify link is active: an inspector scanning an old card sees that it is no longer valid.'}
      </p>
      {url && (
        <p className="mt-2 break-all rounded-md bg-accent-50 px-3 py-2 text-sm">
          Verify link:{' '}
          <a href={url} className="font-semibold text-accent-700 underline" data-testid="verify-url" target="_blank" rel="noreferrer">
            {url}
          </a>
          <span className="block text-xs text-stone-600">Shown once; print a new wallet card so its QR code carries this link.</span>
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
        onConfirm={() =>
          issue.mutate(welderId, {
            onSuccess: (issued) => {
              setUrl(issued.url);
              close();
            },
          })
        }
      >
        {active ? 'The current link stops working at once, and so does the QR code on every card printed with it.' : 'Anyone with the link sees the name, stamp and status of each qualification today.'}
      </ConfirmDialog>
      <ConfirmDialog
        open={confirm === 'revoke'}
        title={`Revoke ${welderName}'s verify link?`}
        confirmLabel="Revoke link"
        busy={revoke.isPending}
        error={revoke.error ? errorMessage(revoke.error) : undefined}
        onCancel={close}
        onConfirm={() =>
          revoke.mutate(welderId, {
            onSuccess: () => {
              setUrl(null);
              close();
            },
          })
        }
      >
        Cards with this link show &ldquo;This card is no longer valid&rdquo; until a new link is issued and a new card printed.
      </ConfirmDialog>
    </div>
  );
}
