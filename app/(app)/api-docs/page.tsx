import type { Metadata } from "next";
import Link from "next/link";
import { GettingStarted } from "@/components/api-docs/getting-started";
import type { Components } from "@/components/api-docs/json-schema";
import { MethodBadge } from "@/components/api-docs/method-badge";
import { OperationCard, type ApiOperation } from "@/components/api-docs/operation-card";
import { RichText } from "@/components/api-docs/rich-text";
import { SchemaFields } from "@/components/api-docs/schema-fields";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { env } from "@/lib/env";
import { openApiDocument, TAGS } from "@/lib/openapi";

export const metadata: Metadata = { title: "API" };

interface Entry {
  method: string;
  path: string;
  operation: ApiOperation;
}

/** The /api/v1 reference, rendered from the same OpenAPI document the API serves. */
export default async function ApiDocsPage() {
  await requireUser("/api-docs");
  const doc = openApiDocument();
  const components = (doc.components.schemas ?? {}) as Components;
  const baseUrl = env().APP_URL;
  const entries: Entry[] = Object.entries(doc.paths).flatMap(([path, item]) =>
    Object.entries(item).map(([method, operation]) => ({ method, path, operation: operation as unknown as ApiOperation })),
  );
  const groups = TAGS.map((tag) => ({ ...tag, entries: entries.filter((e) => e.operation.tags?.[0] === tag.name) })).filter((g) => g.entries.length > 0);

  return (
    <>
      <PageHeader
        eyebrow="Bench automation"
        title="API"
        description={
          <>
            The JSON API under <code className="font-mono">/api/v1</code>, for scripts on bench PCs and for the app itself. This page is drawn
            from the OpenAPI 3.1 document at{" "}
            <Link href="/api/v1/openapi.json" className="text-copper-dark underline underline-offset-2">
              /api/v1/openapi.json
            </Link>
            , which is generated from the same schemas the server validates with.
          </>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[14rem_minmax(0,1fr)]">
        <nav aria-label="API sections" className="no-print lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:self-start lg:overflow-y-auto">
          <ul className="space-y-3 text-sm">
            <li>
              <a href="#getting-started" className="font-medium text-ink hover:text-copper-dark">
                Getting started
              </a>
            </li>
            {groups.map((g) => (
              <li key={g.name}>
                <a href={`#tag-${g.name}`} className="font-medium text-ink hover:text-copper-dark">
                  {g.name}
                </a>
                <ul className="mt-1 space-y-0.5">
                  {g.entries.map((e) => (
                    <li key={e.operation.operationId}>
                      <a href={`#${e.operation.operationId}`} className="flex items-baseline gap-1.5 text-xs text-ink-soft hover:text-copper-dark">
                        <span className="w-10 shrink-0 font-mono text-[11px] uppercase">{e.method}</span>
                        <span>{e.operation.summary}</span>
                      </a>
                    </li>
                  ))}
                </ul>
              </li>
            ))}
            <li>
              <a href="#schemas" className="font-medium text-ink hover:text-copper-dark">
                Schemas
              </a>
            </li>
          </ul>
        </nav>

        <div className="min-w-0 space-y-10">
          <GettingStarted id="getting-started" baseUrl={baseUrl} description={doc.info.description ?? ""} />

          {groups.map((g) => (
            <section key={g.name} id={`tag-${g.name}`} aria-labelledby={`tag-${g.name}-title`} className="scroll-mt-4 space-y-4">
              <div>
                <h2 id={`tag-${g.name}-title`} className="text-lg font-semibold">
                  {g.name}
                </h2>
                <p className="text-sm text-ink-soft">{g.description}</p>
                <ul className="mt-2 space-y-1">
                  {g.entries.map((e) => (
                    <li key={e.operation.operationId} className="flex flex-wrap items-center gap-2 text-sm">
                      <MethodBadge method={e.method} />
                      <a href={`#${e.operation.operationId}`} className="break-all font-mono text-[13px] text-ink hover:text-copper-dark">
                        {e.path}
                      </a>
                    </li>
                  ))}
                </ul>
              </div>
              {g.entries.map((e) => (
                <OperationCard key={e.operation.operationId} method={e.method} path={e.path} operation={e.operation} components={components} baseUrl={baseUrl} />
              ))}
            </section>
          ))}

          <section id="schemas" aria-labelledby="schemas-title" className="scroll-mt-4 space-y-4">
            <div>
              <h2 id="schemas-title" className="text-lg font-semibold">
                Schemas
              </h2>
              <p className="text-sm text-ink-soft">Every named shape the operations above refer to. Fields marked * are always present (responses) or required (requests).</p>
            </div>
            {Object.entries(components).map(([name, schema]) => (
              <Card key={name} id={`schema-${name}`} className="scroll-mt-4">
                <CardHeader title={<span className="font-mono">{name}</span>} description={schema.description ? <RichText text={schema.description} inline /> : undefined} />
                <CardBody>
                  <SchemaFields schema={schema} components={components} caption={`Fields of ${name}`} />
                </CardBody>
              </Card>
            ))}
          </section>
        </div>
      </div>
    </>
  );
}
