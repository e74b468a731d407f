export function receivedAt(date: string | null | undefined): string {
  if (!date) return '—';
  const d = new Date(date);
  return Number.isNaN(d.getTime()) ? date : d.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' });
}
