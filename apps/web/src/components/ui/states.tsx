// The three states every screen has besides "here is your data": still loading, nothing yet, went wrong.
import type { ReactNode } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { Button } from './button';
import { AlertIcon, BanIcon } from './icons';
import { Spinner } from './spinner';

export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-2 px-4 py-10 text-stone-600 justify-center">
      <Spinner className="size-5 text-accent-600" />
      <span>{label}</span>
    </div>
  );
}

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-stone-300 bg-white px-6 py-10 text-center">
      <p className="font-semibold text-stone-800">{title}</p>
      {children && <div className="mx-auto mt-1 max-w-prose text-sm text-stone-600">{children}</div>}
      {action && <div className="mt-4 flex justify-center">{action}</div>}
    </div>
  );
}

export function ErrorState({ error, onRetry, title }: { error: unknown; onRetry?: () => void; title?: string }) {
  const status = error instanceof ApiError ? error.status : undefined;
  const heading =
    title ??
    (status === 404
      ? 'Not found'
      : status === 403
        ? 'Not available for your role'
        : status === 0
          ? 'No connection'
          : 'Could not load this');
  return (
    <div role="alert" className="flex gap-3 rounded-lg border border-red-200 bg-red-50 px-4 py-4 text-red-900">
      <AlertIcon className="mt-0.5 size-5 shrink-0" />
      <div className="min-w-0 flex-1">
        <p className="font-semibold">{heading}</p>
        <p className="text-sm">{errorMessage(error)}</p>
        {onRetry && status !== 404 && status !== 403 && (
          <Button className="mt-3" onClick={onRetry}>
            Try again
          </Button>
        )}
      </div>
    </div>
  );
}

export function ForbiddenState({ children }: { children?: ReactNode }) {
  return (
    <div role="alert" className="flex gap-3 rounded-lg border border-stone-300 bg-white px-4 py-6 text-stone-800">
      <BanIcon className="mt-0.5 size-5 shrink-0 text-stone-500" />
      <div>
        <p className="font-semibold">Not available for your role</p>
        <p className="text-sm text-stone-600">{children ?? 'This screen belongs to the QA manager.'}</p>
      </div>
    </div>
  );
}
