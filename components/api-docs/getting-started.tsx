import Link from "next/link";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { RichText } from "./rich-text";

export interface GettingStartedProps {
  id: string;
  baseUrl: string;
  /** The document's own description: credentials, roles, errors, lists, idempotency, conventions. */
  description: string;
}

function Command({ children }: { children: string }) {
  return <pre className="mt-1.5 overflow-x-auto rounded-md border border-rule bg-paper-sunk px-3 py-2 font-mono text-[12.5px] leading-5 text-ink">{children}</pre>;
}

/** From nothing to a logged capture: a token, a first call, the bench script and its curl equivalent. */
export function GettingStarted({ id, baseUrl, description }: GettingStartedProps) {
  return (
    <Card id={id} className="scroll-mt-4">
      <CardHeader title="Getting started" description="A token, a first call, then captures from the bench without a browser." />
      <CardBody className="space-y-5 text-sm">
        <ol className="list-decimal space-y-5 pl-5 marker:font-semibold marker:text-ink-faint">
          <li>
            <h3 className="font-semibold">Get a token</h3>
            <p className="mt-1 text-ink-soft">
              On your{" "}
              <Link href="/profile" className="text-copper-dark underline underline-offset-2">
                profile page
              </Link>
              , under API tokens, name a token (e.g. “bench 3”) and create it; it is shown once, so copy it then. Or, on the server:
            </p>
            <Command>{"TANKBOOK_TOKEN=$(npm run -s create-token -- --email you@lab.example --name \"bench 3\")"}</Command>
            <p className="mt-1.5 text-ink-soft">A token acts with your role; revoke it on the profile page when the bench PC is retired.</p>
          </li>
          <li>
            <h3 className="font-semibold">Check it</h3>
            <Command>{`curl -sS -H "Authorization: Bearer $TANKBOOK_TOKEN" ${baseUrl}/api/v1/me`}</Command>
            <p className="mt-1.5 text-ink-soft">
              answers <code className="font-mono">{"{id, email, name, role}"}</code>; a 401 problem means the token is wrong or revoked.
            </p>
          </li>
          <li>
            <h3 className="font-semibold">Log a capture from the bench</h3>
            <p className="mt-1 text-ink-soft">
              The build&apos;s id is the last part of its page&apos;s address (<code className="font-mono">/builds/…</code>). The bench script needs only Node 20
              or newer: it uploads the CSV, waits for the analysis and prints one line each for the measured frequency, the drift and the verdict.
            </p>
            <Command>{`TANKBOOK_TOKEN=tbk_… node scripts/bench-upload.mjs --url ${baseUrl} --build $BUILD_ID capture.csv --channel CH1 --note "after C2 swap"`}</Command>
            <p className="mt-1.5 text-ink-soft">
              Exit status 0 when analysed, 1 when the analysis failed (the reason is printed), 2 for bad usage, an HTTP error (the problem&apos;s detail is
              printed) or a timeout (<code className="font-mono">--timeout</code>, 120 s by default). The same with curl:
            </p>
            <Command>
              {`curl -sS -H "Authorization: Bearer $TANKBOOK_TOKEN" -H "Idempotency-Key: $(uuidgen)" \\\n  -F "file=@capture.csv" -F "channel=CH1" \\\n  ${baseUrl}/api/v1/builds/$BUILD_ID/runs\n# → 201 {"id":"…","status":"queued"}; then poll until status is done or failed:\ncurl -sS -H "Authorization: Bearer $TANKBOOK_TOKEN" ${baseUrl}/api/v1/runs/$RUN_ID`}
            </Command>
          </li>
        </ol>
        <div className="border-t border-rule pt-4">
          <h3 className="mb-1 font-semibold">How the API behaves</h3>
          <RichText text={description.split(/\n{2,}/).slice(1).join("\n\n")} className="max-w-3xl text-ink-soft" />
        </div>
      </CardBody>
    </Card>
  );
}
