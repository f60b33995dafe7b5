import type { Metadata } from 'next';
import { PageHeader, Panel } from '~/components/ui';
import { openApiDocument, type JsonSchema, type Operation } from '~/server/openapi/document';
import { requirePagePrincipal } from '~/server/session';

export const metadata: Metadata = { title: 'API reference' };

// Rendered on the server from the same document as /api/openapi.json: no script, no CDN, so it
// reads the same offline.

const METHOD_STYLE: Record<string, string> = {
  get: 'bg-sea-50 text-sea-800 border-sea-200',
  post: 'bg-emerald-50 text-emerald-800 border-emerald-200',
  put: 'bg-amber-50 text-amber-900 border-amber-200',
  patch: 'bg-amber-50 text-amber-900 border-amber-200',
  delete: 'bg-brick-50 text-brick-700 border-brick-200',
};

/** A leaf schema in a few words: type, allowed values, pattern and bounds. */
function describe(schema: JsonSchema): string {
  if (schema.anyOf) return schema.anyOf.map(describe).join(' or ');
  const parts: string[] = [];
  if ('const' in schema) return JSON.stringify(schema.const);
  if (schema.enum) parts.push(schema.enum.map((v) => JSON.stringify(v)).join(' | '));
  else if (schema.type)
    parts.push(Array.isArray(schema.type) ? schema.type.join(' | ') : schema.type);
  if (schema.type === 'array' && schema.items && !schema.items.properties)
    parts.push(`of ${describe(schema.items)}`);
  if (typeof schema.format === 'string') parts.push(`format ${schema.format}`);
  if (typeof schema.pattern === 'string') parts.push(`pattern ${schema.pattern}`);
  const bound = (key: string, words: string) => {
    if (typeof schema[key] === 'number') parts.push(`${words} ${schema[key] as number}`);
  };
  bound('minimum', '≥');
  bound('maximum', '≤');
  bound('minLength', 'length ≥');
  bound('maxLength', 'length ≤');
  bound('minItems', 'items ≥');
  bound('maxItems', 'items ≤');
  if ('default' in schema) parts.push(`default ${JSON.stringify(schema.default)}`);
  return parts.join(', ') || 'any';
}

function objectOf(schema: JsonSchema): JsonSchema | undefined {
  if (schema.properties) return schema;
  if (schema.type === 'array' && schema.items?.properties) return schema.items;
  return undefined;
}

function SchemaFields({ schema }: { schema: JsonSchema }) {
  if (schema.anyOf?.some((s) => objectOf(s))) {
    return (
      <ol className="space-y-2">
        {schema.anyOf.map((branch, i) => (
          <li key={i}>
            <p className="text-sm text-slate-600">{i === 0 ? 'Either' : 'or'}</p>
            <SchemaFields schema={branch} />
          </li>
        ))}
      </ol>
    );
  }
  const object = objectOf(schema);
  if (!object) return <p className="font-mono text-sm">{describe(schema)}</p>;
  const required = new Set(object.required ?? []);
  return (
    <ul className="space-y-1 border-l border-sand-200 pl-3">
      {schema.type === 'array' && <li className="text-sm text-slate-600">a list of:</li>}
      {Object.entries(object.properties ?? {}).map(([name, field]) => (
        <li key={name}>
          <span className="font-mono text-sm font-semibold">{name}</span>
          {required.has(name) ? (
            <span className="ml-1 text-sm text-brick-700">required</span>
          ) : (
            <span className="ml-1 text-sm text-slate-600">optional</span>
          )}
          {objectOf(field) || field.anyOf?.some((s) => objectOf(s)) ? (
            <div className="mt-1">
              <SchemaFields schema={field} />
            </div>
          ) : (
            <span className="ml-2 font-mono text-sm text-slate-700">{describe(field)}</span>
          )}
        </li>
      ))}
      {object.additionalProperties === false && (
        <li className="text-sm text-slate-600">No other fields.</li>
      )}
    </ul>
  );
}

function OperationView({ method, path, op }: { method: string; path: string; op: Operation }) {
  const body = op.requestBody ? Object.entries(op.requestBody.content)[0] : undefined;
  return (
    <article id={op.operationId} className="border-t border-sand-200 py-4 first:border-t-0">
      <h3 className="flex flex-wrap items-baseline gap-2">
        <span
          className={`rounded border px-2 py-0.5 font-mono text-sm font-semibold uppercase ${METHOD_STYLE[method] ?? ''}`}
        >
          {method}
        </span>
        <code className="font-mono font-semibold text-slate-900">{path}</code>
      </h3>
      <p className="mt-1 text-slate-800">{op.summary}</p>
      <p className="mt-1 text-sm text-slate-600">
        {op['x-permission'] === 'public'
          ? 'No sign-in needed.'
          : `Signed in, with the permission ${op['x-permission']}.`}{' '}
        Success: {Object.keys(op.responses)[0]}.
      </p>
      {op.parameters && (
        <table className="mt-3 w-full text-left text-sm">
          <caption className="sr-only">Parameters of {path}</caption>
          <thead>
            <tr className="text-slate-600">
              <th className="py-1 pr-4 font-medium">Parameter</th>
              <th className="py-1 pr-4 font-medium">In</th>
              <th className="py-1 font-medium">Value</th>
            </tr>
          </thead>
          <tbody>
            {op.parameters.map((p) => (
              <tr key={`${p.in}-${p.name}`} className="border-t border-sand-100 align-top">
                <td className="py-1 pr-4 font-mono font-semibold">
                  {p.name}
                  {p.required ? '' : '?'}
                </td>
                <td className="py-1 pr-4">{p.in}</td>
                <td className="py-1 font-mono break-all">{describe(p.schema)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {body && (
        <div className="mt-3">
          <p className="text-sm font-medium text-slate-700">Body ({body[0]})</p>
          <div className="mt-1">
            <SchemaFields schema={body[1].schema} />
          </div>
          {body[1].example !== undefined && (
            <details className="mt-2">
              <summary className="cursor-pointer text-sm text-sea-700">Example</summary>
              <pre className="mt-1 overflow-x-auto rounded bg-sand-50 p-3 text-sm">
                {JSON.stringify(body[1].example, null, 2)}
              </pre>
            </details>
          )}
        </div>
      )}
    </article>
  );
}

export default async function ApiReferencePage() {
  await requirePagePrincipal();
  const doc = openApiDocument();
  const groups = new Map<string, { method: string; path: string; op: Operation }[]>();
  for (const [path, ops] of Object.entries(doc.paths))
    for (const [method, op] of Object.entries(ops)) {
      const tag = op.tags[0] ?? 'api';
      groups.set(tag, [...(groups.get(tag) ?? []), { method, path, op }]);
    }
  return (
    <>
      <PageHeader
        title="API reference"
        lead={
          <>
            Every route of the Reelwright API, read from the same OpenAPI 3.1 document that{' '}
            <a href="/api/openapi.json" className="text-sea-700 underline underline-offset-2">
              /api/openapi.json
            </a>{' '}
            serves. {doc.info.description}
          </>
        }
      />
      <div className="space-y-6">
        {[...groups.entries()].map(([tag, operations]) => (
          <Panel key={tag} title={`/api/${tag}`} id={`api-${tag}`}>
            {operations.map((o) => (
              <OperationView key={`${o.method} ${o.path}`} {...o} />
            ))}
          </Panel>
        ))}
      </div>
    </>
  );
}
