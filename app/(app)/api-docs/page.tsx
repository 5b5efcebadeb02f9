import type { Metadata } from "next";
import { requirePageActor } from "@/server/authz";
import { openApiDocument } from "@/server/api-docs/openapi";
import { PageHeading, Section } from "@/ui/section";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "API" };

type Schema = {
  $ref?: string;
  type?: string | string[];
  description?: string;
  properties?: Record<string, Schema>;
  required?: string[];
  items?: Schema;
  enum?: unknown[];
  oneOf?: Schema[];
  allOf?: Schema[];
  default?: unknown;
  example?: unknown;
  format?: string;
};
type Operation = {
  tags?: string[];
  summary?: string;
  description?: string;
  parameters?: { name: string; in: string; required?: boolean; description?: string; schema?: Schema }[];
  requestBody?: { required?: boolean; content?: Record<string, { schema: Schema }> };
  responses: Record<string, { description?: string; content?: Record<string, { schema: Schema }> }>;
};

const schemas = openApiDocument.components.schemas as Record<string, Schema>;
const refName = (ref: string) => ref.replace("#/components/schemas/", "");
const resolve = (schema: Schema): Schema => (schema.$ref ? resolve(schemas[refName(schema.$ref)] ?? {}) : schema);

function typeLabel(schema: Schema): string {
  if (schema.$ref) return refName(schema.$ref);
  if (schema.oneOf) return schema.oneOf.map(typeLabel).join(" | ");
  if (schema.allOf) return schema.allOf.map(typeLabel).join(" & ");
  if (schema.enum) return schema.enum.map((value) => JSON.stringify(value)).join(" | ");
  const type = Array.isArray(schema.type) ? schema.type.join(" | ") : (schema.type ?? "any");
  if (type === "array" && schema.items) {
    const item = typeLabel(schema.items);
    return item.includes(" ") ? `(${item})[]` : `${item}[]`;
  }
  return schema.format ? `${type} (${schema.format})` : type;
}

/** The descriptions use Markdown's `code` spans; show them as code, everything else as text. */
function Prose({ text }: { text: string }) {
  return (
    <>
      {text.split("`").map((part, index) =>
        index % 2 === 1 ? (
          <code key={index} className="rounded bg-silt px-1 font-mono text-[0.9em]">
            {part}
          </code>
        ) : (
          part
        ),
      )}
    </>
  );
}

function Fields({ schema }: { schema: Schema }) {
  const resolved = resolve(schema);
  const parts = resolved.allOf ? resolved.allOf.map(resolve) : [resolved];
  const rows = parts.flatMap((part) => Object.entries(part.properties ?? {}).map(([name, field]) => ({ name, field, required: part.required?.includes(name) ?? false })));
  if (rows.length === 0) return <p className="font-mono text-xs text-slate-700">{typeLabel(schema)}</p>;
  return (
    <table className="w-full text-xs">
      <tbody>
        {rows.map(({ name, field, required }) => (
          <tr key={name} className="border-b border-slate-100 align-top">
            <td className="whitespace-nowrap py-1 pr-3 font-mono text-river">
              {name}
              {required ? <span className="text-ember" title="required"> *</span> : null}
            </td>
            <td className="py-1 pr-3 font-mono text-slate-700">{typeLabel(field)}</td>
            <td className="py-1 text-slate-700">
              <Prose text={field.description ?? (field.$ref ? (resolve(field).description ?? "") : "")} />
              {field.default !== undefined ? <span className="text-slate-600"> Default {JSON.stringify(field.default)}.</span> : null}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const methodColors: Record<string, string> = { get: "bg-shallows-pale text-river", post: "bg-river text-white", put: "bg-reed text-white", delete: "bg-ember text-white", patch: "bg-reed text-white" };

export default async function ApiDocsPage() {
  await requirePageActor();
  const paths = openApiDocument.paths as Record<string, Record<string, Operation>>;
  const operations = Object.entries(paths).flatMap(([path, methods]) => Object.entries(methods).map(([method, operation]) => ({ path, method, operation })));
  return (
    <div className="flex flex-col gap-6">
      <PageHeading title="API">
        <Prose text={openApiDocument.info.description} />{" "}
        <a href="/api/openapi" className={textLinkClass}>
          The OpenAPI 3.1 document (JSON)
        </a>
        .
      </PageHeading>
      {openApiDocument.tags.map((tag) => (
        <Section key={tag.name} id={`api-${tag.name.toLowerCase()}`} title={tag.name} description={tag.description}>
          <div className="flex flex-col gap-5">
            {operations
              .filter(({ operation }) => operation.tags?.includes(tag.name))
              .map(({ path, method, operation }) => {
                const body = operation.requestBody?.content?.["application/json"]?.schema;
                const example = body ? resolve(body).example : undefined;
                return (
                  <article key={`${method} ${path}`} className="rounded-md border border-slate-200 p-4" data-testid="api-operation">
                    <h3 className="flex flex-wrap items-center gap-2">
                      <span className={`rounded px-2 py-0.5 font-mono text-xs font-bold uppercase ${methodColors[method] ?? "bg-slate-200"}`}>{method}</span>
                      <code className="font-mono text-sm font-semibold text-slate-900">{path}</code>
                      <span className="text-sm text-slate-700">— {operation.summary}</span>
                    </h3>
                    {operation.description ? (
                      <p className="mt-2 text-sm text-slate-700">
                        <Prose text={operation.description} />
                      </p>
                    ) : null}
                    {operation.parameters?.length ? (
                      <div className="mt-3">
                        <h4 className="text-xs font-semibold uppercase tracking-wide text-slate-600">Parameters</h4>
                        <ul className="mt-1 text-xs">
                          {operation.parameters.map((parameter) => (
                            <li key={parameter.name}>
                              <span className="font-mono text-river">{parameter.name}</span> ({parameter.in}
                              {parameter.required ? ", required" : ""}) — {parameter.description}
                            </li>
                          ))}
                        </ul>
                      </div>
                    ) : null}
                    {body ? (
                      <div className="mt-3">
                        <h4 className="text-xs font-semibold uppercase tracking-wide text-slate-600">Request body{operation.requestBody?.required ? "" : " (optional)"}</h4>
                        <Fields schema={body} />
                        {example ? <pre className="mt-2 overflow-x-auto rounded bg-silt p-3 text-xs">{JSON.stringify(example, null, 2)}</pre> : null}
                      </div>
                    ) : null}
                    <div className="mt-3">
                      <h4 className="text-xs font-semibold uppercase tracking-wide text-slate-600">Responses</h4>
                      <ul className="mt-1 text-xs">
                        {Object.entries(operation.responses).map(([status, response]) => {
                          const schema = response.content?.["application/json"]?.schema;
                          return (
                            <li key={status} className="py-0.5">
                              <span className={`num font-mono font-semibold ${status.startsWith("2") ? "text-reed" : "text-ember"}`}>{status}</span>{" "}
                              {response.description}
                              {schema ? <span className="font-mono text-slate-600"> → {typeLabel(schema)}</span> : null}
                            </li>
                          );
                        })}
                      </ul>
                    </div>
                  </article>
                );
              })}
          </div>
        </Section>
      ))}
      <Section id="api-schemas" title="Schemas" description="The shapes the operations above refer to.">
        <div className="flex flex-col gap-4">
          {Object.entries(schemas).map(([name, schema]) => (
            <div key={name} id={`schema-${name}`}>
              <h3 className="font-mono text-sm font-semibold text-river">{name}</h3>
              {schema.description ? (
                <p className="text-xs text-slate-700">
                  <Prose text={schema.description} />
                </p>
              ) : null}
              <Fields schema={schema} />
            </div>
          ))}
        </div>
      </Section>
    </div>
  );
}
