// A JSON Schema as an indented list of fields: name, type, required, allowed values.
import type { JsonSchema } from '../api/openapi-queries';

function typeOf(s: JsonSchema): string {
  if (s.const !== undefined) return JSON.stringify(s.const);
  if (s.enum) return s.enum.map((v) => JSON.stringify(v)).join(' | ');
  const alts = s.anyOf ?? s.oneOf;
  if (alts) return alts.map(typeOf).join(' | ');
  const t = Array.isArray(s.type) ? s.type.join(' | ') : (s.type ?? 'any');
  if (t === 'array' && s.items) return `${typeOf(s.items)}[]`;
  return s.format ? `${t} (${s.format})` : t;
}

function limits(s: JsonSchema): string {
  const parts: string[] = [];
  if (s.minLength !== undefined) parts.push(`≥ ${s.minLength} chars`);
  if (s.maxLength !== undefined) parts.push(`≤ ${s.maxLength} chars`);
  if (s.minimum !== undefined) parts.push(`≥ ${s.minimum}`);
  if (s.maximum !== undefined) parts.push(`≤ ${s.maximum}`);
  if (s.default !== undefined) parts.push(`default ${JSON.stringify(s.default)}`);
  return parts.join(', ');
}

function objectOf(s: JsonSchema): JsonSchema | undefined {
  if (s.properties) return s;
  if (s.items?.properties) return s.items;
  const alts = s.anyOf ?? s.oneOf;
  return alts?.find((a) => a.properties || a.items?.properties) && objectOf(alts.find((a) => a.properties || a.items?.properties)!);
}

export function SchemaView({ schema, depth = 0 }: { schema: JsonSchema; depth?: number }) {
  const obj = objectOf(schema);
  if (!obj?.properties) return <code className="text-sm">{typeOf(schema)}</code>;
  return (
    <ul className={depth ? 'ml-4 border-l border-stone-200 pl-3' : ''}>
      {Object.entries(obj.properties).map(([name, prop]) => (
        <li key={name} className="py-0.5 text-sm">
          <code className="font-semibold">{name}</code>
          {!obj.required?.includes(name) && <span className="text-stone-500">?</span>}{' '}
          <code className="text-accent-700">{typeOf(prop)}</code>
          {limits(prop) && <span className="ml-2 text-stone-500">{limits(prop)}</span>}
          {depth < 4 && objectOf(prop) && <SchemaView schema={prop} depth={depth + 1} />}
        </li>
      ))}
    </ul>
  );
}
