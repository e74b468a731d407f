import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { mailQueries } from '@/features/dev-mail/api/mail-queries';
import { receivedAt } from '@/features/dev-mail/components/received-at';
import { DevLayout } from './dev-layout';

export default function DevMailRoute() {
  const mail = useQuery(mailQueries.list());
  return (
    <DevLayout>
      <PageHeader title="Mail" description="Newest first. The list refreshes every few seconds." />
      {mail.isPending ? (
        <LoadingState label="Loading mail…" />
      ) : mail.isError ? (
        <ErrorState error={mail.error} onRetry={() => void mail.refetch()} />
      ) : mail.data.length === 0 ? (
        <EmptyState title="No mail yet">Invitations and password links appear here as soon as Beadroll sends them.</EmptyState>
      ) : (
        <ul className="divide-y divide-stone-100 overflow-hidden rounded-lg border border-stone-200 bg-white shadow-sm">
          {mail.data.map((m) => (
            <li key={m.id}>
              <Link to={paths.devMailMessage.href(m.id)} className="flex flex-col gap-0.5 px-4 py-3 hover:bg-accent-50/60 sm:flex-row sm:items-baseline sm:gap-4">
                <span className="w-44 shrink-0 text-sm text-stone-500">{receivedAt(m.date)}</span>
                <span className="w-64 shrink-0 truncate text-sm text-stone-700">{m.to}</span>
                <span className="min-w-0 flex-1 truncate font-semibold text-stone-900">{m.subject || '(no subject)'}</span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </DevLayout>
  );
}
