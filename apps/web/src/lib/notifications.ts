// A tiny store of short-lived notices ("Invitation sent", "Could not reach the server") shown by the
// Toaster. The query client raises them once per request, so hooks and screens never do it themselves.
import { useSyncExternalStore } from 'react';

export interface Notice {
  id: number;
  tone: 'success' | 'error';
  message: string;
}

let notices: Notice[] = [];
let nextId = 1;
const listeners = new Set<() => void>();

function emit() {
  for (const listener of listeners) listener();
}

export function dismissNotice(id: number): void {
  notices = notices.filter((n) => n.id !== id);
  emit();
}

export function notify(tone: Notice['tone'], message: string): void {
  const id = nextId++;
  notices = [...notices.slice(-3), { id, tone, message }];
  emit();
  setTimeout(() => dismissNotice(id), tone === 'error' ? 8000 : 4000);
}

export function useNotices(): Notice[] {
  return useSyncExternalStore(
    (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    () => notices,
  );
}
