import { Agent } from "node:http";
import fc from "fast-check";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { appUrl } from "../../helpers/stack";
import { createApiPerson, createFixture, waitForRun, type ApiPerson, type Fixture } from "../api/helpers";
import {
  answerOf,
  closeBucketClient,
  expectClear4xx,
  expectHealthy,
  expectRefusedChangesNothing,
  FUZZ_SEED,
  HOSTILE_TEXT,
  multipartBody,
  PATH_LIKE_NAMES,
  storedCounts,
  type Answer,
} from "./helpers";

// POST /api/v1/builds/{id}/runs (multipart, streamed to storage) under hostile input: every refusal is a clear
// 4xx that stored nothing (rows and bucket objects counted before and after), every acceptance got a key the
// server made, and the app keeps answering. A malformed CSV inside a well-formed upload is accepted on purpose
// (the upload form says so: "the analysis will say exactly what it cannot read"); such runs must end `failed`
// with a message, never stuck and never a 5xx.

/** One connection per request: a refused upload must be answered on its own connection, not on a reused one. */
const freshConnections = new Agent({ keepAlive: false });
let fx: Fixture;
/** Uploaders used in turn, so the per-user write limit (600 a minute) is never what answers. */
let uploaders: ApiPerson[];
let turn = 0;
let sequence = 0;

/** Server-made capture keys: captures/<yyyy>/<mm>/<runId>-<uuid>.csv (lib/storage/object-keys.ts). */
const SERVER_KEY = /^captures\/\d{4}\/\d{2}\/[0-9a-f-]{36}-[0-9a-f-]{36}\.csv$/;

beforeAll(async () => {
  fx = await createFixture("hostile-upload");
  uploaders = await Promise.all([1, 2, 3].map((i) => createApiPerson("technician", `hostile-up-${i}`)));
}, 120_000);

afterAll(async () => {
  closeBucketClient();
  await closeDb();
  await closeLucia();
});

function nextUploader(): ApiPerson {
  return uploaders[turn++ % uploaders.length];
}

async function post(body: Buffer, contentType: string | null, extraHeaders: Record<string, string> = {}): Promise<Answer> {
  const req = request(appUrl()).post(`/api/v1/builds/${fx.buildId}/runs`).agent(freshConnections).set("authorization", `Bearer ${nextUploader().token}`).redirects(0);
  if (contentType !== null) req.set("content-type", contentType);
  for (const [k, v] of Object.entries(extraHeaders)) req.set(k, v);
  return answerOf(await req.send(body));
}

/** A small valid capture, different every call (so it is never a duplicate of an earlier one). */
function validCapture(): string {
  sequence += 1;
  return synthCaptureCsv({ frequencyHz: 400e3 + sequence * 37, sampleRateHz: 20e6, samples: 2048, amplitudeV: 1, noiseVrms: 0.001, seed: 7000 + sequence });
}

/** Bodies that are not a capture the importer can read, but arrive in a well-formed upload. */
const malformedCsv = fc.oneof(
  fc.uint8Array({ minLength: 1, maxLength: 2048 }).map((b) => Buffer.from(b)),
  fc.string({ maxLength: 400 }).map((s) => Buffer.from(`Time (s),Out (V)\n${s}`)),
  fc.constantFrom(
    "Time (s),Out (V)\n",
    "Time (s),Out (V)\n0,0.1\n1e-8,abc\n2e-8,0.3\n",
    "Time (s);Out (V)\n0;1;2;3\n1e-8\n",
    "\"unterminated,quote\n0,1\n",
    "Time (s),Out (V)\n0,NaN\n1e-8,Infinity\n2e-8,-Infinity\n",
    "Time (s),Out (V)\n0,1e309\n1e-8,-1e309\n",
    "Time (s),Out (V)\n1,0.1\n1,0.2\n1,0.3\n",
    "a".repeat(70_000),
    "Time (s),Out (V)\n" + "0,0.1,".repeat(5000) + "\n",
    "\u0000\u0000\u0000Time (s),Out (V)\n0,0\n",
    "\ufeff\ufeffTime (s),Out (V)\n0,0.1\n",
  ).map((s) => Buffer.from(s)),
);

const captureBody = fc.oneof({ weight: 2, arbitrary: malformedCsv }, { weight: 1, arbitrary: fc.constant(null) }, { weight: 1, arbitrary: fc.constant(Buffer.alloc(0)) });

const filename = fc.oneof(
  fc.constantFrom(...PATH_LIKE_NAMES),
  fc.string({ maxLength: 60 }).map((s) => `${s.replace(/["\r\n]/g, "")}.csv`),
  fc.string({ unit: "binary", maxLength: 40 }).map((s) => `${s.replace(/["\r\n\u0000]/g, "")}.csv`),
  fc.constantFrom("scope.png", "capture", "capture.csv.exe", ".csv", "capture.CSV", "capture.tsv", "capture.txt", "a\r\nb.csv", "nul\u0000.csv"),
);

const partType = fc.constantFrom<string | undefined>(undefined, "text/csv", "text/plain", "application/octet-stream", "image/png", "application/json", "text/html", "application/x-msdownload", "", "text/csv; charset=utf-16");

const fieldName = fc.constantFrom("channel", "probe", "supplyV", "temperatureC", "note", "tweakId", "keepDuplicate", "file", "__proto__", "x".repeat(300));
const fieldValue = fc.oneof(
  fc.constantFrom(...HOSTILE_TEXT),
  fc.constantFrom("10", "x10", "10:1", "0", "-1", "1e309", "NaN", "12", "-300", "999", "true", "maybe", "00000000-0000-4000-8000-000000000000", "../x"),
  fc.string({ maxLength: 50 }),
);

function typed(m: { body: Buffer; contentType: string }): { body: Buffer; type: string } {
  return { body: m.body, type: m.contentType };
}

describe("multipart capture uploads under fuzzing", () => {
  it("answers every generated upload with a clear 4xx that stored nothing, or a run whose key the server made", async () => {
    let accepted = 0;
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(
        filename,
        partType,
        captureBody,
        fc.array(fc.tuple(fieldName, fieldValue), { maxLength: 5 }),
        fc.boolean(),
        async (name, type, content, fields, fieldsFirst) => {
          const file = { name: "file", filename: Buffer.from(name, "utf8"), contentType: type, content: content ?? validCapture() };
          const texts = fields.map(([n, v]) => ({ name: n, value: v }));
          const { body, contentType } = multipartBody(fieldsFirst ? [...texts, file] : [file, ...texts]);
          const before = await storedCounts();
          const answer = await post(body, contentType);
          const context = `upload ${JSON.stringify(name).slice(0, 80)} as ${type} with ${JSON.stringify(fields).slice(0, 200)}`;
          if (await expectRefusedChangesNothing(answer, before, context)) {
            refused += 1;
            return;
          }
          accepted += 1;
          expect([200, 201], context).toContain(answer.status);
          const run = await db()("runs").where({ id: JSON.parse(answer.text).id }).first();
          expect(run.object_key, context).toMatch(SERVER_KEY);
          // Shown only, never a key; busboy keeps the last path segment of what the client wrote.
          expect(run.original_filename, context).toBe(name.split(/[\\/]/).pop());
          const after = await storedCounts();
          expect(after.runs - before.runs, context).toBe(1);
          expect(after.objects - before.objects, context).toBe(1);
        },
      ),
      { seed: FUZZ_SEED, numRuns: 70, endOnFailure: true },
    );
    // The generators must reach both sides of the contract, or the property proves little.
    expect(refused).toBeGreaterThan(10);
    expect(accepted).toBeGreaterThan(3);
    await expectHealthy();
  }, 120_000);

  it("refuses wrong content types and broken envelopes with a clear 4xx and stores nothing", async () => {
    const csv = Buffer.from(validCapture());
    const good = multipartBody([{ name: "file", filename: "scope.csv", contentType: "text/csv", content: csv }], "fixedboundary");
    const cases: { label: string; body: Buffer; type: string | null; status: number[] }[] = [
      { label: "JSON", body: Buffer.from(JSON.stringify({ file: csv.toString() })), type: "application/json", status: [415] },
      { label: "plain text", body: csv, type: "text/csv", status: [415] },
      { label: "no content type", body: csv, type: null, status: [415] },
      { label: "form-urlencoded", body: Buffer.from(`file=${encodeURIComponent(csv.toString())}`), type: "application/x-www-form-urlencoded", status: [415] },
      { label: "multipart without a boundary", body: good.body, type: "multipart/form-data", status: [400] },
      { label: "multipart with the wrong boundary", body: good.body, type: "multipart/form-data; boundary=another", status: [400] },
      { label: "multipart with an empty body", body: Buffer.alloc(0), type: good.contentType, status: [400] },
      { label: "multipart of random bytes", body: Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 131 + 7) % 256)), type: good.contentType, status: [400] },
      { label: "a body cut off inside the file", body: good.body.subarray(0, good.body.length - 40), type: good.contentType, status: [400] },
      { label: "a body cut off inside the part header", body: good.body.subarray(0, 60), type: good.contentType, status: [400] },
      { label: "no file field", ...typed(multipartBody([{ name: "note", value: "no file here" }], "nofile")), status: [400] },
      { label: "the file in another field", body: multipartBody([{ name: "capture", filename: "scope.csv", content: csv }], "otherfield").body, type: "multipart/form-data; boundary=otherfield", status: [400] },
      { label: "a part header with a bare CR LF in the file name", body: multipartBody([{ name: "file", filename: "a\r\nContent-Type: text/html\r\n.csv", content: csv }], "crlf").body, type: "multipart/form-data; boundary=crlf", status: [400, 415] },
      { label: "a NUL in the file name", body: multipartBody([{ name: "file", filename: "nul\u0000.csv", content: csv }], "nulname").body, type: "multipart/form-data; boundary=nulname", status: [400] },
      { label: "an oversized field", body: multipartBody([{ name: "note", value: "n".repeat(40_000) }, { name: "file", filename: "scope.csv", content: csv }], "bigfield").body, type: "multipart/form-data; boundary=bigfield", status: [400] },
    ];
    for (const c of cases) {
      const before = await storedCounts();
      const answer = await post(c.body, c.type).catch((err: Error) => {
        throw new Error(`${c.label}: ${err.message}`);
      });
      expectClear4xx(answer, c.label);
      expect(c.status.concat(400), `${c.label}: ${answer.status} ${answer.text.slice(0, 200)}`).toContain(answer.status);
      expect(await storedCounts(), `${c.label} stored something`).toEqual(before);
    }
    await expectHealthy();
  }, 60_000);

  it("refuses a Content-Length far over the capture limit before reading, and a bad Idempotency-Key", async () => {
    const before = await storedCounts();
    const { body, contentType } = multipartBody([{ name: "file", filename: "scope.csv", content: validCapture() }]);
    // Refused on the announced size alone: the body is never read, so the short one sent here does not matter.
    const lie = await new Promise<Answer>((resolve, reject) => {
      const url = new URL(`/api/v1/builds/${fx.buildId}/runs`, appUrl());
      import("node:http").then(({ request: httpRequest }) => {
        const req = httpRequest(url, { method: "POST", headers: { authorization: `Bearer ${nextUploader().token}`, "content-type": contentType, "content-length": String(2 ** 40) } }, (res) => {
          const chunks: Buffer[] = [];
          res.on("data", (c) => chunks.push(c));
          res.on("end", () => {
            resolve({ status: res.statusCode ?? 0, contentType: String(res.headers["content-type"] ?? ""), text: Buffer.concat(chunks).toString() });
            req.destroy();
          });
        });
        req.on("error", reject);
        req.write(body);
      }, reject);
    });
    expect(expectClear4xx(lie, "Content-Length of 1 TiB").status).toBe(413);
    for (const key of ["k".repeat(201), "with space", "tab\there", "é"]) {
      const answer = await post(body, contentType, { "idempotency-key": key });
      expect(expectClear4xx(answer, `Idempotency-Key ${JSON.stringify(key).slice(0, 20)}`).detail).toMatch(/Idempotency-Key/);
    }
    expect(await storedCounts()).toEqual(before);
    await expectHealthy();
  }, 60_000);

  it("analyses every malformed capture it accepted to `failed` with a message, and a good one beside them to `done`", async () => {
    // Files whose header the importer cannot read are refused before a run exists (lib/logbook/capture-precheck.ts).
    const unreadable = ["not a capture at all", "Time (s),Out (V)\n", "Time (s),Out (V)\n0,NaN\n1e-8,NaN\n2e-8,NaN\n", "\u0000\u0001\u0002\u0003binary\u00ff"];
    for (const [i, text] of unreadable.entries()) {
      const before = await storedCounts();
      const { body, contentType } = multipartBody([{ name: "file", filename: `unreadable-${i}.csv`, contentType: "text/csv", content: text }]);
      const answer = await post(body, contentType);
      expect(expectClear4xx(answer, `unreadable ${i}`).status).toBe(400);
      expect(await storedCounts()).toEqual(before);
    }
    const bad = ["Time (s),Out (V)\n0,0.1\n1e-8,abc\n", "Time (s),Out (V)\n1,0.1\n1,0.2\n1,0.3\n1,0.4\n"];
    const ids: string[] = [];
    for (const [i, text] of bad.entries()) {
      const { body, contentType } = multipartBody([{ name: "file", filename: `bad-${i}.csv`, contentType: "text/csv", content: text }]);
      const answer = await post(body, contentType);
      expect(answer.status, answer.text).toBe(201);
      ids.push(JSON.parse(answer.text).id);
    }
    const good = multipartBody([{ name: "file", filename: "good.csv", contentType: "text/csv", content: validCapture() }]);
    const goodAnswer = await post(good.body, good.contentType);
    expect(goodAnswer.status, goodAnswer.text).toBe(201);
    for (const id of ids) {
      const run = await waitForRun(id, fx.team.viewer, 60_000);
      expect(run.status, `run ${id}`).toBe("failed");
      expect(String(run.error ?? "").length, `run ${id} error`).toBeGreaterThan(10);
    }
    expect((await waitForRun(JSON.parse(goodAnswer.text).id, fx.team.viewer, 60_000)).status).toBe("done");
    await expectHealthy();
  }, 120_000);
});
