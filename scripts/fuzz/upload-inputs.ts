// Upload inputs: multipart envelopes written by hand, and CSV captures inside well-formed uploads.
import type { Random } from "./random";
import { UNKNOWN_ID, caller, short, text, type FixtureIds, type FuzzInput } from "./input-kit";

type Part = { name: string; value: string } | { name: string; filename: Buffer | string; contentType?: string; content: Buffer | string; star?: string };

/** A multipart/form-data body written by hand: any bytes in names, types and values, in the order given. */
export function multipartBody(parts: Part[], boundary: string): Buffer {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    chunks.push(Buffer.from(`--${boundary}\r\n`));
    if ("filename" in p) {
      chunks.push(Buffer.from(`Content-Disposition: form-data; name="${p.name}"; filename="`), Buffer.from(p.filename), Buffer.from(`"${p.star ? `; filename*=${p.star}` : ""}\r\n`));
      if (p.contentType !== undefined) chunks.push(Buffer.from(`Content-Type: ${p.contentType}\r\n`));
      chunks.push(Buffer.from("\r\n"), Buffer.from(p.content), Buffer.from("\r\n"));
    } else {
      chunks.push(Buffer.from(`Content-Disposition: form-data; name="${p.name}"\r\n\r\n`), Buffer.from(p.value, "utf8"), Buffer.from("\r\n"));
    }
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return Buffer.concat(chunks);
}

/** A small capture a worker analyses in milliseconds; `salt` makes its bytes unique (no duplicate refusals). */
export function smallCapture(r: Random, salt: number, rows = 400): string {
  const f = 400e3 + (salt % 997) * 31;
  const dt = 5e-8;
  const lines = ["Time (s),Out (V)"];
  for (let i = 0; i < rows; i++) lines.push(`${(i * dt).toExponential(6)},${(Math.sin(2 * Math.PI * f * i * dt) + (r.next() - 0.5) * 0.01).toFixed(5)}`);
  return `${lines.join("\n")}\n`;
}

const UPLOAD_FIELDS = ["channel", "probe", "supplyV", "temperatureC", "note", "tweakId", "keepDuplicate", "label", "sampleRateHz"];

function fieldValue(r: Random, fx: FixtureIds): string {
  return r.weighted<() => string>([
    [3, () => text(r)],
    [2, () => r.pick(["1", "2", "x10", "x1", "-5", "1e309", "NaN", "true", "12.0", "25", "-300", "1000", fx.tweakId, UNKNOWN_ID, ""])],
  ])();
}

export function multipartInput(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const boundary = `----fuzz${index.toString(16)}${r.string(8, "abcdef0123456789")}`;
  const parts: Part[] = [];
  const notes: string[] = [];
  for (let i = r.int(0, 3); i > 0; i--) {
    const name = r.bool(0.8) ? r.pick(UPLOAD_FIELDS) : text(r).replace(/["\r\n]/g, "") || "x";
    parts.push({ name, value: fieldValue(r, fx) });
    notes.push(name);
  }
  const fileCount = r.weighted([[1, 0], [6, 1], [1, 2]] as const);
  for (let i = 0; i < fileCount; i++) {
    const filename = r.weighted<() => Buffer | string>([
      [3, () => r.pick(["capture.csv", "../../etc/passwd.csv", "..\\..\\x.csv", `${"a".repeat(300)}.csv`, "x.exe", "", ".csv", "捕获.csv", "\u202ecod.csv", "a\u0000b.csv", "<script>.csv", "con.csv", "x.csv.exe"])],
      [1, () => r.bytes(r.int(1, 20))],
      [1, () => `${text(r).replace(/["\r\n]/g, "")}.csv`],
    ])();
    const star = r.bool(0.15) ? r.pick(["UTF-8''cap%00ture.csv", "UTF-8''%E0%A4%A.csv", "UTF-8''ok.csv", "garbage", "UTF-8''%2e%2e%2fx.csv"]) : undefined;
    const content = r.weighted<() => Buffer | string>([
      [3, () => smallCapture(r, index * 7 + i)],
      [1, () => r.bytes(r.int(0, 512))],
      [1, () => ""],
    ])();
    parts.push({ name: r.bool(0.85) ? "file" : r.pick(["File", "capture", "files[]", ""]), filename, contentType: r.pick(["text/csv", "text/csv", "application/octet-stream", "image/png", undefined, "text/csv; charset=utf-16"]), content, star });
    notes.push(`file(${short(Buffer.isBuffer(filename) ? filename.toString("hex") : filename, 40)}${star ? `; *=${star}` : ""})`);
  }
  let body = multipartBody(parts, boundary);
  let type = `multipart/form-data; boundary=${boundary}`;
  const envelope = r.weighted<string>([[7, "intact"], [1, "truncated"], [1, "wrong boundary"], [1, "no boundary"]]);
  if (envelope === "truncated") body = body.subarray(0, Math.max(0, body.length - r.int(5, 60)));
  if (envelope === "wrong boundary") type = "multipart/form-data; boundary=not-the-one";
  if (envelope === "no boundary") type = "multipart/form-data";
  const headers: Record<string, string> = { "content-type": type };
  if (r.bool(0.1)) headers["idempotency-key"] = `fuzz-${r.int(0, 20)}`;
  const buildId = r.bool(0.9) ? fx.buildId : r.pick([UNKNOWN_ID, "x", fx.runId]);
  return {
    index,
    class: "multipart",
    method: "POST",
    path: `/api/v1/builds/${buildId}/runs`,
    caller: caller(r, "technician"),
    headers,
    body,
    summary: `POST /api/v1/builds/${buildId}/runs multipart(${envelope}) [${notes.join(", ")}] ${body.length} bytes`,
  };
}

/** CSV captures that are wrong in the ways scope exports and hand edits are wrong, in a well-formed upload. */
function csvContent(r: Random, salt: number): { content: Buffer; label: string } {
  const base = smallCapture(r, salt, r.int(16, 600));
  const lines = base.trimEnd().split("\n");
  const mutation = r.pick([
    "as is", "semicolons", "tabs", "crlf", "bom", "utf16", "no header", "header only", "empty", "drop a column", "extra column", "text cell", "nan", "infinity",
    "huge", "decreasing time", "repeated time", "gap", "one row", "binary tail", "long line", "quoted", "comma decimals", "scientific junk", "nul", "many channels", "random bytes",
  ]);
  const at = r.int(1, Math.max(1, lines.length - 1));
  switch (mutation) {
    case "semicolons":
      return { content: Buffer.from(lines.map((l) => l.replace(",", ";")).join("\n")), label: mutation };
    case "tabs":
      return { content: Buffer.from(lines.map((l) => l.replace(",", "\t")).join("\n")), label: mutation };
    case "crlf":
      return { content: Buffer.from(lines.join("\r\n")), label: mutation };
    case "bom":
      return { content: Buffer.from(`\ufeff${lines.join("\n")}`), label: mutation };
    case "utf16":
      return { content: Buffer.from(`\ufeff${lines.join("\n")}`, "utf16le"), label: mutation };
    case "no header":
      return { content: Buffer.from(lines.slice(1).join("\n")), label: mutation };
    case "header only":
      return { content: Buffer.from(`${lines[0]}\n`), label: mutation };
    case "empty":
      return { content: Buffer.alloc(0), label: mutation };
    case "drop a column":
      lines[at] = lines[at].split(",")[0];
      break;
    case "extra column":
      lines[at] = `${lines[at]},1,2`;
      break;
    case "text cell":
      lines[at] = `${lines[at].split(",")[0]},${r.pick(["abc", "1.2.3", "--", "0x10", "1,5"])}`;
      break;
    case "nan":
      lines[at] = `${lines[at].split(",")[0]},NaN`;
      break;
    case "infinity":
      lines[at] = `${lines[at].split(",")[0]},${r.pick(["Infinity", "-Infinity", "1e309"])}`;
      break;
    case "huge":
      lines[at] = `${lines[at].split(",")[0]},1e300`;
      break;
    case "decreasing time":
      lines.splice(1, lines.length - 1, ...lines.slice(1).reverse());
      break;
    case "repeated time":
      lines[at] = `${lines[Math.max(1, at - 1)].split(",")[0]},${lines[at].split(",")[1]}`;
      break;
    case "gap":
      lines.splice(at, Math.min(5, lines.length - at));
      break;
    case "one row":
      return { content: Buffer.from(`${lines[0]}\n${lines[1] ?? "0,0"}\n`), label: mutation };
    case "binary tail":
      return { content: Buffer.concat([Buffer.from(lines.join("\n")), r.bytes(r.int(1, 200))]), label: mutation };
    case "long line":
      lines[at] = `${lines[at]}${"9".repeat(r.int(1000, 70_000))}`;
      break;
    case "quoted":
      lines[at] = `"${lines[at].replace(",", '","')}"${r.bool() ? "" : '"'}`;
      break;
    case "comma decimals":
      return { content: Buffer.from(lines.map((l, i) => (i === 0 ? l.replace(",", ";") : l.replace(",", ";").replace(/\./g, ","))).join("\n")), label: mutation };
    case "scientific junk":
      lines[at] = `${r.pick(["1e", "e5", "1e+", "--1", "+-1", ".", "1..2"])},0.1`;
      break;
    case "nul":
      lines[at] = `${lines[at]}\u0000`;
      break;
    case "many channels":
      return { content: Buffer.from(lines.map((l, i) => (i === 0 ? `${l}${",Ch".repeat(40)}` : `${l}${",0.1".repeat(40)}`)).join("\n")), label: mutation };
    case "random bytes":
      return { content: r.bytes(r.int(1, 2048)), label: mutation };
    default:
      break;
  }
  return { content: Buffer.from(`${lines.join("\n")}\n`), label: mutation };
}

export function csvInput(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const boundary = `----fuzzcsv${index.toString(16)}`;
  const { content, label } = csvContent(r, index);
  const parts: Part[] = [];
  if (r.bool(0.3)) parts.push({ name: "channel", value: r.pick(["1", "2", "Out (V)", "9"]) });
  parts.push({ name: "file", filename: r.pick(["capture.csv", "scope.CSV", "run.txt", "export.csv"]), contentType: r.pick(["text/csv", "text/plain", "application/vnd.ms-excel"]), content });
  const body = multipartBody(parts, boundary);
  return {
    index,
    class: "csv",
    method: "POST",
    path: `/api/v1/builds/${fx.buildId}/runs`,
    caller: r.bool(0.9) ? { auth: r.bool(0.8) ? "token" : "cookie", role: r.pick(["technician", "engineer", "admin"] as const) } : caller(r, "technician"),
    headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
    body,
    summary: `POST /api/v1/builds/${fx.buildId}/runs csv(${label}) ${content.length} bytes`,
  };
}
