import { Card, CardBody } from "@/components/ui/card";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { curlExample } from "@/lib/openapi/curl";
import { ROLE_EXTENSION } from "@/lib/openapi/operation";
import { ruleText, type Components, type JsonSchema } from "./json-schema";
import { MethodBadge } from "./method-badge";
import { RichText } from "./rich-text";
import { SchemaFields } from "./schema-fields";
import { TypeLabel } from "./type-label";

export interface ApiOperation {
  operationId: string;
  summary?: string;
  description?: string;
  tags?: string[];
  security?: Record<string, string[]>[];
  parameters?: { name: string; in: string; required?: boolean; description?: string; schema: JsonSchema }[];
  requestBody?: { required?: boolean; content: Record<string, { schema: JsonSchema; example?: unknown }> };
  responses: Record<string, { description: string; content?: Record<string, { schema: JsonSchema }>; headers?: Record<string, unknown> }>;
  [ROLE_EXTENSION]?: string;
}

export interface OperationCardProps {
  method: string;
  path: string;
  operation: ApiOperation;
  components: Components;
  baseUrl: string;
}

const isProblem = (status: string) => Number(status) >= 400;

/** One operation: what it does, who may call it, its inputs, its answers and errors, and a curl line. */
export function OperationCard({ method, path, operation, components, baseUrl }: OperationCardProps) {
  const role = operation[ROLE_EXTENSION];
  const body = operation.requestBody ? Object.entries(operation.requestBody.content)[0] : undefined;
  const statuses = Object.entries(operation.responses);
  const answers = statuses.filter(([status]) => !isProblem(status));
  const problems = statuses.filter(([status]) => isProblem(status));
  return (
    <Card id={operation.operationId} className="scroll-mt-4">
      <header className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-rule px-4 py-3">
        <MethodBadge method={method} />
        <h3 className="min-w-0 break-all font-mono text-sm font-semibold text-ink">{path}</h3>
        <span className="text-sm text-ink-soft">{operation.summary}</span>
        <span className="ml-auto rounded border border-rule px-1.5 py-0.5 text-xs text-ink-soft">
          {role === "public" ? "public" : `${role}+`}
        </span>
      </header>
      <CardBody className="space-y-4 text-sm">
        <RichText text={operation.description} className="max-w-3xl text-ink-soft" />

        {operation.parameters?.length ? (
          <section aria-label="Parameters">
            <h4 className="mb-1.5 text-xs font-semibold uppercase tracking-wide text-ink-faint">Parameters</h4>
            <Table caption={`Parameters of ${method.toUpperCase()} ${path}`}>
              <thead>
                <tr>
                  <Th>Name</Th>
                  <Th>In</Th>
                  <Th>Type</Th>
                  <Th>Rules</Th>
                  <Th className="w-1/2">Meaning</Th>
                </tr>
              </thead>
              <tbody>
                {operation.parameters.map((p) => (
                  <Tr key={`${p.in}-${p.name}`}>
                    <Td className="whitespace-nowrap font-mono text-[12.5px]">
                      {p.name}
                      {p.required ? <span className="ml-1 text-copper" title="required">*</span> : null}
                    </Td>
                    <Td className="text-xs text-ink-soft">{p.in}</Td>
                    <Td>
                      <TypeLabel schema={p.schema} />
                    </Td>
                    <Td className="text-xs text-ink-soft">{ruleText(p.schema)}</Td>
                    <Td className="text-ink-soft">
                      <RichText text={p.description} />
                    </Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          </section>
        ) : null}

        {body ? (
          <section aria-label="Request body">
            <h4 className="mb-1.5 text-xs font-semibold uppercase tracking-wide text-ink-faint">
              Request body <span className="font-mono normal-case tracking-normal">{body[0]}</span>
              {operation.requestBody?.required === false ? " (optional)" : null}
            </h4>
            <SchemaFields schema={body[1].schema} components={components} caption={`Request body of ${method.toUpperCase()} ${path}`} />
          </section>
        ) : null}

        <section aria-label="Responses">
          <h4 className="mb-1.5 text-xs font-semibold uppercase tracking-wide text-ink-faint">Responses</h4>
          <ul className="space-y-1">
            {answers.map(([status, r]) => {
              const content = r.content ? Object.entries(r.content)[0] : undefined;
              return (
                <li key={status} className="flex items-baseline gap-2">
                  <span className="num w-8 shrink-0 font-mono text-xs font-semibold text-verdict-pass">{status}</span>
                  <div className="min-w-0 flex-1">
                    <span className="text-ink-soft">{r.description}</span>
                    {content ? (
                      <span className="ml-2 text-xs text-ink-faint">
                        {content[0]} <TypeLabel schema={content[1].schema} />
                      </span>
                    ) : null}
                    {r.headers ? <span className="ml-2 text-xs text-ink-faint">headers: {Object.keys(r.headers).join(", ")}</span> : null}
                  </div>
                </li>
              );
            })}
          </ul>
          {problems.length ? (
            <ul className="mt-2 space-y-1 border-t border-rule/70 pt-2">
              {problems.map(([status, r]) => (
                <li key={status} className="flex items-baseline gap-2">
                  <span className="num w-8 shrink-0 font-mono text-xs font-semibold text-verdict-fail">{status}</span>
                  <RichText text={r.description} className="min-w-0 flex-1 text-ink-soft" />
                </li>
              ))}
            </ul>
          ) : null}
        </section>

        <section aria-label="Example">
          <h4 className="mb-1.5 text-xs font-semibold uppercase tracking-wide text-ink-faint">Example</h4>
          <pre className="overflow-x-auto rounded-md border border-rule bg-paper-sunk px-3 py-2 font-mono text-[12.5px] leading-5 text-ink">
            {curlExample(path, method, operation, baseUrl)}
          </pre>
        </section>
      </CardBody>
    </Card>
  );
}
