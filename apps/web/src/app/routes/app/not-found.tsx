import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/states';

export default function NotFoundRoute() {
  return (
    <EmptyState title="There is no page at this address" action={<Link className="font-semibold text-accent-700 underline" to="/">Go to the start page</Link>}>
      The link may be old, or the screen may belong to a later part of Beadroll.
    </EmptyState>
  );
}
