import type { Role } from '@beadroll/rules';
import type { ReactNode } from 'react';
import { useUser } from '@/lib/auth';
import { PageHeader } from './page-header';
import { ForbiddenState } from './states';

/** Shows a screen only to the roles it belongs to; anyone else sees why it is closed to them. */
export function RequireRole({ roles, title, children, message }: { roles: Role[]; title: string; children: ReactNode; message?: string }) {
  const me = useUser();
  if (roles.includes(me.role)) return <>{children}</>;
  return (
    <>
      <PageHeader title={title} />
      <ForbiddenState>{message}</ForbiddenState>
    </>
  );
}
