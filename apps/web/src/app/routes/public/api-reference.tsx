// The API reference, rendered by the app itself from /api/openapi.json (no third-party viewer, no CDN).
// Public like the description: it holds no data, only the shape of the API.
import { useQuery } from '@tanstack/react-query';
import { BeadIcon } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { openApiQueries, type Operation } from '@/features/openapi/api/openapi-queries';
import { SchemaView } from '@/features/openapi/components/schema-view';

const methodColour: Record<string, string> = {
  get: 'bg-sky-100 text-sky-900',
  post: 'bg-emerald-100 text-emerald-900',
  put: 'bg-amber-100 text-amber-900',
  patch: 'bg-amber-100 text-amber-900',
  delete: 'bg-red-100 text-red-900',
};

function OperationView({ method, path, op }: { method: string; path: string; op: Operation }) {
  const params = op.parameters ?? [];
  const body = Object.entries(op.requestBody?.content ?? {})[0];
  const success = Object.entries(op.responses).find(([s]) => s.startsWith('2'));
  const successMedia = success && Object.entries(success[1].content ?? {})[0];
  const id = `${method}-${path}`.replace(/[^\w-]/g, '_');
  return (
    <section aria-labelledby={id} className="rounded-lg border border-stone-200 bg-white p-4">
      <h3 id={id} className="flex flex-wrap items-center gap-2">
        <span className={`rounded px-2 py-0.5 text-xs font-bold uppercase ${methodColour[method] ?? ''}`}>{method}</span>
        <code className="font-semibold">/api{path}</code>
        <span className="text-stone-700">— {op.summary}</span>
      </h3>
      {op.description && <p className="mt-1 text-sm text-stone-600">{op.description}</p>}
      {params.length > 0 && (
        <div className="mt-3">
          <h4 className="text-sm font-semibold">Parameters</h4>
          <ul>
            {params.map((p) => (
              <li key={`${p.in}-${p.name}`} className="text-sm">
                <code className="font-semibold">{p.name}</code> <span className="text-stone-500">({p.in}{p.required ? ', required' : ''})</span>{' '}
                {p.schema && <SchemaView schema={p.schema} />}
              </li>
            ))}
          </ul>
        </div>
      )}
      {body?.[1].schema && (
        <div className="mt-3">
          <h4 className="text-sm font-semibold">Request body <span className="font-normal text-stone-500">({body[0]})</span></h4>
          <SchemaView schema={body[1].schema} />
        </div>
      )}
      {success && (
        <div className="mt-3">
          <h4 className="text-sm font-semibold">
            Answer {success[0]} <span className="font-normal text-stone-500">{successMedia ? `(${successMedia[0]})` : '(no body)'}</span>
          </h4>
          {successMedia?.[1].schema && <SchemaView schema={successMedia[1].schema} />}
        </div>
      )}
    </section>
  );
}

export default function ApiReferenceRoute() {
  const doc = useQuery(openApiQueries.document());
  const groups = new Map<string, { method: string; path: string; op: Operation }[]>();
  for (const [path, ops] of Object.entries(doc.data?.paths ?? {}))
    for (const [method, op] of Object.entries(ops)) {
      const tag = op.tags?.[0] ?? 'Other';
      groups.set(tag, [...(groups.get(tag) ?? []), { method, path, op }]);
    }
  return (
    <div className="min-h-dvh bg-stone-50">
      <main className="mx-auto max-w-5xl px-4 py-6">
        <p className="mb-4 flex items-center gap-2 text-lg font-bold text-stone-900">
          <span className="grid size-8 place-items-center rounded-md bg-accent-600 text-white">
            <BeadIcon className="size-5" />
          </span>
          Beadroll · API reference
        </p>
        {doc.isPending ? (
          <LoadingState label="Loading the API description…" />
        ) : doc.isError ? (
          <ErrorState error={doc.error} onRetry={() => void doc.refetch()} />
        ) : (
          <>
            <h1 className="text-2xl font-bold">{doc.data.info.title}</h1>
            <p className="mt-1 max-w-prose text-stone-700">{doc.data.info.description}</p>
            <p className="mt-2 text-sm text-stone-700">
              Machine-readable: <a className="text-accent-700 underline" href="/api/openapi.json">/api/openapi.json</a> (OpenAPI {doc.data.openapi}).
              Other systems authenticate with an API token from Settings: <code>Authorization: Bearer brt_…</code>.
            </p>
            <nav aria-label="Sections" className="mt-4 flex flex-wrap gap-2">
              {[...groups.keys()].map((tag) => (
                <a key={tag} href={`#tag-${tag.replace(/\W/g, '_')}`} className="rounded-full bg-white px-3 py-1 text-sm shadow-sm ring-1 ring-stone-200">
                  {tag}
                </a>
              ))}
            </nav>
            {[...groups.entries()].map(([tag, ops]) => (
              <section key={tag} aria-label={tag} className="mt-6">
                <h2 id={`tag-${tag.replace(/\W/g, '_')}`} className="mb-2 text-xl font-bold">{tag}</h2>
                <div className="space-y-3">
                  {ops.map((o) => (
                    <OperationView key={`${o.method} ${o.path}`} {...o} />
                  ))}
                </div>
              </section>
            ))}
          </>
        )}
      </main>
    </div>
  );
}
