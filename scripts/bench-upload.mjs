#!/usr/bin/env node
// Bench upload: sends one oscilloscope CSV to a build through the /api/v1 token API, waits for the analysis and
// prints the measured frequency, the drift against the prediction and the verdict, one line each.
// Dependency-free on purpose (Node's own fetch, FormData and file-backed Blob) so a bench PC needs only Node 20+.
//
//   node scripts/bench-upload.mjs --url http://127.0.0.1:3000 --token $TOKEN --build BUILD_ID FILE
//        [--channel NAME] [--probe 10] [--note TEXT] [--tweak TWEAK_ID] [--timeout 120]
//
// Exit status: 0 analysed (done), 1 analysis failed, 2 bad usage, HTTP error or timeout.
import { randomUUID } from "node:crypto";
import { openAsBlob, statSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";

const USAGE =
  "usage: node scripts/bench-upload.mjs --url URL --token TOKEN --build BUILD_ID FILE " +
  "[--channel NAME] [--probe N] [--note TEXT] [--tweak TWEAK_ID] [--timeout SECONDS]\n" +
  "  TOKEN may also come from the TANKBOOK_TOKEN environment variable (keeps it out of the process list).";

/** Upload attempts on a dropped connection or a 502/503/504; the Idempotency-Key makes a retry safe. */
const UPLOAD_ATTEMPTS = 3;

class ExitError extends Error {
  constructor(message, code) {
    super(message);
    this.code = code;
  }
}

function parseArguments(argv) {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: {
        url: { type: "string" },
        token: { type: "string" },
        build: { type: "string" },
        channel: { type: "string" },
        probe: { type: "string" },
        note: { type: "string" },
        tweak: { type: "string" },
        timeout: { type: "string", default: "120" },
        help: { type: "boolean", short: "h" },
      },
    });
  } catch (err) {
    throw new ExitError(`${err.message}\n${USAGE}`, 2);
  }
  const { values, positionals } = parsed;
  if (values.help) throw new ExitError(USAGE, 0);
  const token = values.token ?? process.env.TANKBOOK_TOKEN;
  const missing = [!values.url && "--url", !token && "--token", !values.build && "--build", positionals.length === 0 && "FILE"].filter(Boolean);
  if (missing.length > 0) throw new ExitError(`missing ${missing.join(", ")}\n${USAGE}`, 2);
  if (positionals.length > 1) throw new ExitError(`one file at a time, got ${positionals.length}\n${USAGE}`, 2);
  const timeoutS = Number(values.timeout);
  if (!Number.isFinite(timeoutS) || timeoutS <= 0) throw new ExitError(`--timeout is a number of seconds above 0, got '${values.timeout}'`, 2);
  let base;
  try {
    base = new URL(values.url);
  } catch {
    throw new ExitError(`--url is not a URL: '${values.url}'`, 2);
  }
  return { base, token, buildId: values.build, file: positionals[0], channel: values.channel, probe: values.probe, note: values.note, tweakId: values.tweak, timeoutS };
}

/** The app may sit under a path prefix behind a proxy, so paths are appended to the URL as given. */
function apiUrl(base, pathname) {
  return `${base.origin}${base.pathname.replace(/\/+$/, "")}/${pathname}`;
}

/** One readable line from an RFC 9457 problem response (or whatever the server sent instead). */
async function problemLine(response) {
  const text = await response.text().catch(() => "");
  let detail = text.trim().slice(0, 500);
  try {
    const body = JSON.parse(text);
    detail = body.detail ?? body.title ?? detail;
    if (body.fields) {
      const fields = Object.entries(body.fields).map(([name, messages]) => `${name}: ${[].concat(messages).join("; ")}`);
      if (fields.length > 0 && !detail.includes(fields[0])) detail += ` (${fields.join(" · ")})`;
    }
  } catch {
    // Not JSON (a proxy's HTML page, say): the text itself is the best detail there is.
  }
  return `HTTP ${response.status} ${response.statusText}${detail ? `: ${detail}` : ""}`;
}

async function uploadCapture(args) {
  let sizeBytes;
  try {
    const stat = statSync(args.file);
    if (!stat.isFile()) throw new Error("not a regular file");
    sizeBytes = stat.size;
  } catch (err) {
    throw new ExitError(`cannot read ${args.file}: ${err.code === "ENOENT" ? "no such file" : err.message}`, 2);
  }
  const idempotencyKey = randomUUID();
  const url = apiUrl(args.base, `api/v1/builds/${encodeURIComponent(args.buildId)}/runs`);
  for (let attempt = 1; ; attempt++) {
    // A file-backed Blob: fetch streams it from disk, so a 500 MB capture never sits in this process's memory.
    const form = new FormData();
    form.append("file", await openAsBlob(args.file, { type: "text/csv" }), path.basename(args.file));
    for (const [name, value] of [["channel", args.channel], ["probe", args.probe], ["note", args.note], ["tweakId", args.tweakId]]) {
      if (value !== undefined) form.append(name, value);
    }
    let response;
    try {
      response = await fetch(url, {
        method: "POST",
        headers: { authorization: `Bearer ${args.token}`, "idempotency-key": idempotencyKey, accept: "application/json" },
        body: form,
      });
    } catch (err) {
      if (attempt < UPLOAD_ATTEMPTS) {
        process.stderr.write(`upload failed (${err.cause?.code ?? err.message}); retrying with the same Idempotency-Key\n`);
        continue;
      }
      throw new ExitError(`cannot reach ${args.base.origin}: ${err.cause?.message ?? err.message}`, 2);
    }
    if ([502, 503, 504].includes(response.status) && attempt < UPLOAD_ATTEMPTS) {
      process.stderr.write(`upload answered ${response.status}; retrying with the same Idempotency-Key\n`);
      await response.body?.cancel();
      continue;
    }
    if (response.status !== 201 && response.status !== 200) throw new ExitError(`upload refused: ${await problemLine(response)}`, 2);
    const run = await response.json();
    process.stderr.write(`uploaded ${path.basename(args.file)} (${sizeBytes} bytes) as run ${run.id}, ${response.headers.get("location") ?? ""}\n`);
    return run;
  }
}

const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

async function waitForRun(args, runId) {
  const url = apiUrl(args.base, `api/v1/runs/${encodeURIComponent(runId)}`);
  const until = Date.now() + args.timeoutS * 1000;
  // A 1M-sample capture is analysed about a second after its upload is answered: start polling close to that
  // and back off from there, so the answer is seen within a few hundred ms of being ready, at a few requests.
  let delayMs = 200;
  for (;;) {
    let response;
    try {
      response = await fetch(url, { headers: { authorization: `Bearer ${args.token}`, accept: "application/json" } });
    } catch (err) {
      throw new ExitError(`cannot reach ${args.base.origin}: ${err.cause?.message ?? err.message}`, 2);
    }
    if (response.status === 429) {
      await response.body?.cancel();
      delayMs = Math.max(delayMs, 1000 * Number(response.headers.get("retry-after") ?? 2));
    } else if (!response.ok) {
      throw new ExitError(`reading run ${runId} failed: ${await problemLine(response)}`, 2);
    } else {
      const run = await response.json();
      if (run.status === "done" || run.status === "failed") return run;
    }
    if (Date.now() + delayMs > until) throw new ExitError(`run ${runId} was not analysed within ${args.timeoutS} s; see ${url}`, 2);
    await sleep(delayMs);
    delayMs = Math.min(delayMs * 1.5, 3000);
  }
}

/** A frequency with an SI prefix; 9 significant digits by default, enough for a ppm-level reading. */
function formatHz(hz, digits = 9) {
  const abs = Math.abs(hz);
  const [scale, unit] = abs >= 1e9 ? [1e9, "GHz"] : abs >= 1e6 ? [1e6, "MHz"] : abs >= 1e3 ? [1e3, "kHz"] : abs >= 1 ? [1, "Hz"] : [1e-3, "mHz"];
  // Number() drops trailing zeros and the exponent toPrecision writes for 100 at 2 digits.
  return `${Number((hz / scale).toPrecision(digits))} ${unit}`;
}

function reportLines(run) {
  const measuredHz = run.measuredHz ?? run.results?.frequencyHz ?? null;
  const uncertaintyHz = run.results?.frequencyUncertaintyHz;
  const frequency =
    measuredHz === null ? "measured frequency: none" : `measured frequency: ${formatHz(measuredHz)}${Number.isFinite(uncertaintyHz) ? ` ± ${formatHz(uncertaintyHz, 2)}` : ""}`;
  const drift =
    run.driftPpm === null || run.driftPpm === undefined
      ? "drift: none (no prediction for this build)"
      : `drift: ${run.driftPpm >= 0 ? "+" : ""}${run.driftPpm.toFixed(1)} ppm against the predicted ${formatHz(run.predictedHz)}`;
  const verdict = `verdict: ${run.verdict ?? "none (the design has no spec)"}`;
  return [frequency, drift, verdict];
}

async function main() {
  const args = parseArguments(process.argv.slice(2));
  const created = await uploadCapture(args);
  const run = await waitForRun(args, created.id);
  if (run.status === "failed") {
    process.stdout.write(`analysis failed: ${run.error ?? "no message"}\n`);
    return 1;
  }
  process.stdout.write(`${reportLines(run).join("\n")}\n`);
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    if (err instanceof ExitError) {
      (err.code === 0 ? process.stdout : process.stderr).write(`${err.code === 0 ? "" : "bench-upload: "}${err.message}\n`);
      process.exit(err.code);
    }
    process.stderr.write(`bench-upload: ${err.stack ?? err}\n`);
    process.exit(2);
  },
);
