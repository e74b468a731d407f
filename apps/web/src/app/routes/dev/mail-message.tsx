import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ChevronLeftIcon } from '@/components/ui/icons';
import { Card, PageHeader } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { mailQueries } from '@/features/dev-mail/api/mail-queries';
import { LinkedText } from '@/features/dev-mail/components/linked-text';
import { receivedAt } from '@/features/dev-mail/components/received-at';
import { DevLayout } from './dev-layout';

// Links inside the HTML view open in the whole window, not inside the frame.
const htmlDocument = (html: string) => `<base target="_top">${html}`;

export default function DevMailMessageRoute() {
  const { id = '' } = useParams();
  const message = useQuery(mailQueries.detail(id));
  const [view, setView] = useState<'text' | 'html'>('text');
  const back = (
    <Link to={paths.devMail.href()} className="mb-2 inline-flex min-h-11 items-center gap-1 text-sm font-semibold text-accent-700 hover:underline sm:min-h-0">
      <ChevronLeftIcon /> Mail
    </Link>
  );
  if (message.isPending) return <DevLayout>{back}<LoadingState label="Loading the message…" /></DevLayout>;
  if (message.isError) return <DevLayout>{back}<ErrorState error={message.error} onRetry={() => void message.refetch()} /></DevLayout>;
  const m = message.data;
  const tabClass = (active: boolean) =>
    `min-h-11 rounded-md px-3 text-sm font-semibold sm:min-h-8 ${active ? 'bg-accent-600 text-white' : 'text-stone-700 hover:bg-stone-200/70'}`;

  return (
    <DevLayout>
      {back}
      <PageHeader title={m.subject || '(no subject)'} />
      <Card className="p-4">
        <dl className="grid grid-cols-[5rem_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm">
          <dt className="font-semibold text-stone-600">From</dt>
          <dd>{m.from}</dd>
          <dt className="font-semibold text-stone-600">To</dt>
          <dd>{m.to}</dd>
          <dt className="font-semibold text-stone-600">Received</dt>
          <dd>{receivedAt(m.date)}</dd>
        </dl>
        {m.html && m.text && (
          <div role="group" aria-label="View" className="mt-4 flex gap-1">
            <button type="button" className={tabClass(view === 'text')} aria-pressed={view === 'text'} onClick={() => setView('text')}>
              Text
            </button>
            <button type="button" className={tabClass(view === 'html')} aria-pressed={view === 'html'} onClick={() => setView('html')}>
              HTML
            </button>
          </div>
        )}
        <div className="mt-4 border-t border-stone-100 pt-4">
          {m.html && (view === 'html' || !m.text) ? (
            <iframe
              title="Message as HTML"
              sandbox="allow-popups allow-top-navigation-by-user-activation"
              srcDoc={htmlDocument(m.html)}
              className="h-[28rem] w-full rounded border border-stone-200 bg-white"
            />
          ) : m.text ? (
            <LinkedText text={m.text} />
          ) : (
            <EmptyState title="This message has no body" />
          )}
        </div>
      </Card>
    </DevLayout>
  );
}
