// API tokens (QA manager): keys for another system (ERP, HR, a customer portal) to read — or read and
// write — the registry through the API, limited to some shops if chosen. The secret is shown once; the
// registry keeps only its hash. Each token is listed with its last use and can be revoked (confirmed).
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { ApiToken, ApiTokenAccess } from '@beadroll/rules';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { FormError, TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { RequireRole } from '@/components/ui/require-role';
import { ApiError, errorMessage } from '@/lib/api-client';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { apiTokenQueries, createApiToken, revokeApiToken } from '@/features/api-tokens/api/api-tokens';

const accessNames: Record<ApiTokenAccess, string> = { read: 'Read only', 'read-write': 'Read and write' };
const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString() : 'never');

function CreateToken({ onCreated }: { onCreated: (secret: string, name: string) => void }) {
  const queryClient = useQueryClient();
  const shops = useQuery(shopQueries.list());
  const [name, setName] = useState('');
  const [access, setAccess] = useState<ApiTokenAccess>('read');
  const [shopIds, setShopIds] = useState<string[]>([]);
  const create = useMutation({
    mutationFn: () => createApiToken({ name, access, shopIds }),
    onSuccess: async (r) => {
      onCreated(r.token, r.apiToken.name);
      setName('');
      setShopIds([]);
      await queryClient.invalidateQueries({ queryKey: apiTokenQueries.all() });
    },
  });
  const fields = create.error instanceof ApiError ? create.error.fields : {};
  return (
    <form
      aria-label="New API token"
      className="rounded-lg border border-stone-200 bg-white p-4"
      onSubmit={(e) => {
        e.preventDefault();
        create.mutate();
      }}
    >
      <h2 className="text-lg font-bold">New token</h2>
      <div className="mt-3 grid gap-3 sm:grid-cols-2">
        <TextField label="Name (what uses it)" value={name} onChange={(e) => setName(e.target.value)} error={fields.name} hint="For example: ERP nightly sync" required />
        <fieldset>
          <legend className="text-sm font-semibold">Access</legend>
          {(['read', 'read-write'] as const).map((a) => (
            <label key={a} className="mr-4 inline-flex min-h-9 items-center gap-2 text-sm">
              <input type="radio" name="access" value={a} checked={access === a} onChange={() => setAccess(a)} />
              {accessNames[a]}
            </label>
          ))}
        </fieldset>
        <fieldset className="sm:col-span-2">
          <legend className="text-sm font-semibold">Shops it may reach (none ticked: every shop)</legend>
          {shops.isError && <p className="text-sm text-red-800">{errorMessage(shops.error)}</p>}
          {shops.data?.map((s) => (
            <label key={s.id} className="mr-4 inline-flex min-h-9 items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={shopIds.includes(s.id)}
                onChange={(e) => setShopIds(e.target.checked ? [...shopIds, s.id] : shopIds.filter((x) => x !== s.id))}
              />
              {s.code} — {s.name}
            </label>
          ))}
          {fields.shopIds && <p className="text-sm text-red-800">{fields.shopIds}</p>}
        </fieldset>
      </div>
      <FormError message={create.isError && Object.keys(fields).length === 0 ? errorMessage(create.error) : undefined} />
      <Button className="mt-3" type="submit" variant="primary" busy={create.isPending}>Create token</Button>
    </form>
  );
}

function TokenList({ onRevoke }: { onRevoke: (t: ApiToken) => void }) {
  const list = useQuery(apiTokenQueries.list());
  if (list.isPending) return <LoadingState label="Loading tokens…" />;
  if (list.isError) return <ErrorState error={list.error} onRetry={() => void list.refetch()} />;
  if (list.data.items.length === 0) return <EmptyState title="No API tokens yet">Create one above for the system that needs it.</EmptyState>;
  return (
    <table className="w-full text-sm">
      <caption className="text-left text-lg font-bold">Tokens</caption>
      <thead>
        <tr className="text-left">
          <th className="py-1 pr-3">Name</th>
          <th className="py-1 pr-3">Starts with</th>
          <th className="py-1 pr-3">Access</th>
          <th className="py-1 pr-3">Shops</th>
          <th className="py-1 pr-3">Created</th>
          <th className="py-1 pr-3">Last used</th>
          <th className="py-1"><span className="sr-only">Actions</span></th>
        </tr>
      </thead>
      <tbody>
        {list.data.items.map((t) => (
          <tr key={t.id} className="border-t border-stone-100">
            <td className="py-1 pr-3 font-semibold">{t.name}</td>
            <td className="py-1 pr-3 font-mono">{t.prefix}…</td>
            <td className="py-1 pr-3">{accessNames[t.access]}</td>
            <td className="py-1 pr-3">{t.shops.length ? t.shops.map((s) => s.code).join(', ') : 'Every shop'}</td>
            <td className="py-1 pr-3">{when(t.createdAt)} by {t.createdBy.name}</td>
            <td className="py-1 pr-3">{when(t.lastUsedAt)}</td>
            <td className="py-1">
              {t.revokedAt ? (
                <span className="text-stone-600">Revoked {when(t.revokedAt)}</span>
              ) : (
                <Button size="row" variant="danger" onClick={() => onRevoke(t)} aria-label={`Revoke ${t.name}`}>Revoke</Button>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export default function ApiTokensRoute() {
  const queryClient = useQueryClient();
  const [created, setCreated] = useState<{ secret: string; name: string } | null>(null);
  const [revoking, setRevoking] = useState<ApiToken | null>(null);
  const revoke = useMutation({
    mutationFn: (id: string) => revokeApiToken(id),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: apiTokenQueries.all() });
      setRevoking(null);
    },
  });
  return (
    <RequireRole roles={['qa_manager']} title="API tokens">
      <PageHeader
        title="API tokens"
        description="Keys for another system to use the registry through its API (sent as Authorization: Bearer). The API reference page lists every route."
      />
      <CreateToken onCreated={(secret, name) => setCreated({ secret, name })} />
      {created && (
        <section role="status" aria-label="New token" className="mt-4 rounded-lg border border-emerald-300 bg-emerald-50 p-4">
          <h2 className="font-bold">Token “{created.name}” created</h2>
          <p className="text-sm">Copy it now: it is shown only this once, and Beadroll keeps only a hash of it.</p>
          <output className="mt-2 block break-all rounded bg-white p-2 font-mono text-sm" aria-label="Token secret">{created.secret}</output>
          <Button className="mt-2" onClick={() => setCreated(null)}>I have copied it</Button>
        </section>
      )}
      <div className="mt-6">
        <TokenList onRevoke={(t) => { revoke.reset(); setRevoking(t); }} />
      </div>
      <ConfirmDialog
        open={revoking !== null}
        title={`Revoke “${revoking?.name ?? ''}”?`}
        confirmLabel="Revoke token"
        onConfirm={() => revoking && revoke.mutate(revoking.id)}
        onCancel={() => setRevoking(null)}
        busy={revoke.isPending}
        error={revoke.isError ? errorMessage(revoke.error) : undefined}
      >
        The system using it loses access at once. This cannot be undone; create a new token if it is needed again.
      </ConfirmDialog>
    </RequireRole>
  );
}
