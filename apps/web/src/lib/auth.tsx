// Who is signed in: the session query, sign-in and sign-out, the guard of the signed-in part of the app,
// and the role checks the shell and the screens share.
import { loginInput, meSchema, type LoginInput, type Me, type Role } from '@beadroll/rules';
import { queryOptions, useMutation, useQueryClient, useSuspenseQuery, type QueryClient } from '@tanstack/react-query';
import { useRef } from 'react';
import { z } from 'zod';
import { redirect } from 'react-router-dom';
import { paths } from '@/config/paths';
import { ApiError, apiRequest, apiSend } from './api-client';

// Asked of /api/auth/session, which answers 200 with nobody when there is no session: opening the
// sign-in page logs no 401 in the browser's console.
const sessionSchema = z.object({ me: meSchema.nullable() });

export const meQuery = queryOptions({
  queryKey: ['auth', 'me'] as const,
  queryFn: async ({ signal }): Promise<Me | null> =>
    (await apiRequest('/api/auth/session', sessionSchema, { signal, redirectOn401: false })).me,
  staleTime: 5 * 60_000,
});

/**
 * The signed-in person. Only inside the signed-in layout, whose loader made sure there is one. While a
 * sign-out (or an expired session) is on its way to the sign-in page, the screens keep the last person
 * for that moment instead of failing.
 */
export function useUser(): Me {
  const { data } = useSuspenseQuery(meQuery);
  const last = useRef(data);
  if (data) last.current = data;
  if (!last.current) throw new ApiError(401, 'unauthenticated', 'Please sign in again.');
  return last.current;
}

/** Where to go after sign-in: only a path inside this app, never another site. */
export function safeRedirect(target: string | null | undefined): string {
  if (!target || !target.startsWith('/') || target.startsWith('//') || target.startsWith(paths.signIn.path)) return '/';
  return target;
}

export function returnPath(url: URL): string {
  return `${url.pathname}${url.search}`;
}

/** Loader of the signed-in layout: asks who is signed in, or sends the visitor to sign in and come back. */
export async function requireUser(queryClient: QueryClient, request: Request): Promise<Me | Response> {
  const me = await queryClient.ensureQueryData(meQuery);
  if (!me) return redirect(paths.signIn.href(returnPath(new URL(request.url))));
  return me;
}

export function homeFor(me: Me): string {
  return me.role === 'welder' ? paths.myQualifications.href() : paths.overview.href();
}

export const roleLabels: Record<Role, string> = {
  qa_manager: 'QA manager',
  foreman: 'Foreman',
  welder: 'Welder',
};

export function hasRole(me: Me, ...roles: Role[]): boolean {
  return roles.includes(me.role);
}

export function useLogin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: LoginInput) =>
      apiRequest('/api/auth/login', meSchema, { method: 'POST', body: loginInput.parse(input), redirectOn401: false }),
    onSuccess: (me) => {
      queryClient.clear();
      queryClient.setQueryData(meQuery.queryKey, me);
    },
    meta: { inlineErrors: true },
  });
}

export function useLogout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => apiSend('/api/auth/logout', { method: 'POST', redirectOn401: false }),
    onSettled: () => {
      queryClient.clear();
      queryClient.setQueryData(meQuery.queryKey, null);
    },
  });
}
