import { dismissNotice, useNotices } from '@/lib/notifications';
import { AlertIcon, CheckCircleIcon } from './icons';

export function Toaster() {
  const notices = useNotices();
  return (
    <div aria-live="polite" className="pointer-events-none fixed inset-x-0 bottom-4 z-50 flex flex-col items-center gap-2 px-3">
      {notices.map((n) => (
        <div
          key={n.id}
          role={n.tone === 'error' ? 'alert' : 'status'}
          className={`pointer-events-auto flex max-w-md items-start gap-2 rounded-md px-4 py-3 text-sm shadow-lg ring-1 ${
            n.tone === 'error' ? 'bg-red-50 text-red-900 ring-red-200' : 'bg-stone-900 text-white ring-stone-800'
          }`}
        >
          {n.tone === 'error' ? <AlertIcon className="mt-0.5 size-4 shrink-0" /> : <CheckCircleIcon className="mt-0.5 size-4 shrink-0" />}
          <span className="flex-1">{n.message}</span>
          <button type="button" onClick={() => dismissNotice(n.id)} className="-my-1 rounded px-1 opacity-70 hover:opacity-100" aria-label="Dismiss">
            ×
          </button>
        </div>
      ))}
    </div>
  );
}
