// `npx tsx scripts/bench/forgot-password.ts --url http://127.0.0.1:3000 --known someone@tankbook.test [--samples 40]`
// Times the forgot-password form for an address with an account and one without, interleaved (known, unknown,
// known, …) so drift on the machine hits both alike, and prints both medians and their difference. The answer
// must not wait on the e-mail (app/(auth)/actions.ts sends it with after()), so the medians should be within a
// few milliseconds. Run it against a development stack: its mail goes to the fake SMTP outbox, never out.
import { randomBytes } from "node:crypto";
import { parseArgs } from "node:util";

const { values } = parseArgs({
  options: { url: { type: "string", default: "http://127.0.0.1:3000" }, known: { type: "string" }, samples: { type: "string", default: "40" } },
  strict: true,
});
if (!values.known) {
  process.stderr.write("usage: tsx scripts/bench/forgot-password.ts --url URL --known ADDRESS-WITH-AN-ACCOUNT [--samples N]\n");
  process.exit(2);
}
const base = values.url.replace(/\/$/, "");
const samples = Math.max(4, Number(values.samples) || 40);

function hiddenFields(html: string): Record<string, string> {
  const form = [...html.matchAll(/<form\b[^>]*>([\s\S]*?)<\/form>/g)].map((m) => m[1]).find((f) => f.includes('name="email"'));
  if (!form) throw new Error("no forgot-password form on the page");
  const fields: Record<string, string> = {};
  for (const tag of form.match(/<input\b[^>]*>/g) ?? []) {
    if (!/type="hidden"/.test(tag)) continue;
    const name = /name="([^"]*)"/.exec(tag)?.[1];
    if (name) fields[name] = (/value="([^"]*)"/.exec(tag)?.[1] ?? "").replace(/&amp;/g, "&").replace(/&quot;/g, '"');
  }
  return fields;
}

async function timeOne(email: string, hidden: Record<string, string>): Promise<number> {
  const body = new FormData();
  for (const [k, v] of Object.entries(hidden)) body.append(k, v);
  body.append("email", email);
  const started = performance.now();
  const res = await fetch(`${base}/forgot-password`, { method: "POST", body, headers: { origin: new URL(base).origin }, redirect: "manual" });
  await res.arrayBuffer();
  const elapsed = performance.now() - started;
  if (res.status !== 200) throw new Error(`forgot-password answered ${res.status}`);
  return elapsed;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

const page = await fetch(`${base}/forgot-password`);
const hidden = hiddenFields(await page.text());
const known: number[] = [];
const unknown: number[] = [];
await timeOne(`warm-up-${randomBytes(4).toString("hex")}@nowhere.test`, hidden);
for (let i = 0; i < samples; i++) {
  known.push(await timeOne(values.known, hidden));
  unknown.push(await timeOne(`nobody-${randomBytes(5).toString("hex")}@nowhere.test`, hidden));
}
const k = median(known);
const u = median(unknown);
process.stdout.write(`forgot-password, ${samples} interleaved pairs against ${base}\n`);
process.stdout.write(`  known address   median ${k.toFixed(1)} ms\n  unknown address median ${u.toFixed(1)} ms\n  difference      ${(k - u).toFixed(1)} ms\n`);
