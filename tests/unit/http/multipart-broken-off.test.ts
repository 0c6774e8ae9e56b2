import { describe, expect, it } from "vitest";
import { readMultipartCapture } from "@/lib/logbook/multipart";

// Found by the fuzz campaign (scripts/fuzz): a multipart body that breaks off inside a file part the parser only
// drains (a second file, or a file under another field name) raised "Unexpected end of form" on that part's
// stream, with no listener, as an uncaughtException in the server. It must end as the request's 400 alone.

function truncatedBody(parts: string[]): Request {
  const boundary = "----broken";
  const text = parts.map((p) => `--${boundary}\r\n${p}`).join("\r\n");
  // No closing boundary, and the last part stops mid-content.
  return new Request("http://127.0.0.1/upload", { method: "POST", headers: { "content-type": `multipart/form-data; boundary=${boundary}` }, body: text });
}

async function settleWithoutUncaught(request: Request): Promise<{ uncaught: unknown[]; fileError: unknown; fieldsError: unknown }> {
  const uncaught: unknown[] = [];
  const onUncaught = (err: unknown) => uncaught.push(err);
  process.on("uncaughtException", onUncaught);
  process.on("unhandledRejection", onUncaught);
  try {
    const parts = readMultipartCapture(request);
    const [file, fields] = await Promise.allSettled([parts.file.then(async (f) => {
      for await (const _ of f.stream) void _;
    }), parts.fields]);
    // Give any stray 'error' event a turn of the loop to surface.
    await new Promise((r) => setTimeout(r, 50));
    return { uncaught, fileError: file.status === "rejected" ? file.reason : null, fieldsError: fields.status === "rejected" ? fields.reason : null };
  } finally {
    process.off("uncaughtException", onUncaught);
    process.off("unhandledRejection", onUncaught);
  }
}

describe("readMultipartCapture on a body that breaks off", () => {
  it("inside a file under another field name: a 400 for the request, nothing uncaught", async () => {
    const r = await settleWithoutUncaught(truncatedBody(['Content-Disposition: form-data; name="capture"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\ntime,ch1\n0,1\n1e-8']));
    expect(r.uncaught).toEqual([]);
    expect(String(r.fileError ?? r.fieldsError)).toMatch(/No file in the field|cannot be read/);
  });

  it("inside a second file after the capture: a 400, nothing uncaught", async () => {
    const r = await settleWithoutUncaught(
      truncatedBody([
        'Content-Disposition: form-data; name="file"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\ntime,ch1\n0,1\n1e-8,0\n',
        'Content-Disposition: form-data; name="file"; filename="b.csv"\r\nContent-Type: text/csv\r\n\r\ntime,ch1\n0,1',
      ]),
    );
    expect(r.uncaught).toEqual([]);
    expect(String(r.fileError ?? r.fieldsError)).toMatch(/cannot be read: Unexpected end of form/);
  });

  it("inside a file whose name is refused: the name's 400, nothing uncaught", async () => {
    const r = await settleWithoutUncaught(truncatedBody([`Content-Disposition: form-data; name="file"; filename="${"n".repeat(300)}.csv"\r\nContent-Type: text/csv\r\n\r\ntime,ch1\n0,1`]));
    expect(r.uncaught).toEqual([]);
    expect(String(r.fileError)).toMatch(/characters long/);
  });

  // Found by the full campaign: busboy reports the malformed header of a part (a NUL in its name) and then goes
  // on to the file part after it; the body was already unpiped, so that file's stream never ended and the
  // upload was never answered. The reader must get the 400 instead of waiting.
  it("after a malformed part header, with the file part that follows: the file's reader gets the 400", async () => {
    const request = truncatedBody([
      'Content-Disposition: form-data; name="nul\u0000inside"\r\n\r\n@SUM(1+1)',
      `Content-Disposition: form-data; name="file"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\n${"0,1\n".repeat(4000)}`,
    ]);
    const settled = await Promise.race([settleWithoutUncaught(request), new Promise<"hangs">((r) => setTimeout(() => r("hangs"), 5_000))]);
    expect(settled).not.toBe("hangs");
    if (settled === "hangs") return;
    expect(settled.uncaught).toEqual([]);
    expect(String(settled.fileError)).toMatch(/cannot be read: Malformed part header/);
    expect(String(settled.fieldsError)).toMatch(/cannot be read: Malformed part header/);
  }, 10_000);

  it("with a text part that has no name parameter: no uncaught rejection", async () => {
    const boundary = "----noname";
    const body = `--${boundary}\r\nContent-Disposition: form-data; filename\r\n\r\nvalue\r\n--${boundary}\r\nContent-Disposition: form-data\r\n\r\nx\r\n--${boundary}--\r\n`;
    const r = await settleWithoutUncaught(new Request("http://127.0.0.1/upload", { method: "POST", headers: { "content-type": `multipart/form-data; boundary=${boundary}` }, body }));
    expect(r.uncaught).toEqual([]);
  });
});
