import { describe, expect, it } from "vitest";
import { assertJsonShape, badTextPath, readBodyText } from "@/lib/http/json-body";

describe("assertJsonShape", () => {
  const limits = { maxKeys: 3, maxDepth: 2 };

  it("counts keys and nesting outside strings only", () => {
    expect(() => assertJsonShape('{"a":1,"b":[{"c":"x:y:z{{[["}]}', { maxKeys: 3, maxDepth: 3 })).not.toThrow();
    expect(() => assertJsonShape('{"a":"\\":::"}', limits)).not.toThrow();
  });

  it("refuses one key too many and one level too deep, naming the limit", () => {
    expect(() => assertJsonShape('{"a":1,"b":2,"c":3,"d":4}', limits)).toThrow("more than 3 keys");
    expect(() => assertJsonShape("[[[1]]]", limits)).toThrow("deeper than 2 levels");
  });
});

describe("badTextPath", () => {
  it("finds a lone surrogate or a NUL by dotted path, in values and keys, and passes paired surrogates", () => {
    expect(badTextPath({ a: [{ note: "ok 😀" }] })).toBeNull();
    expect(badTextPath({ a: [{ note: "bad \udc00" }] })).toEqual({ path: "a.0.note", problem: "surrogate" });
    expect(badTextPath({ name: "x\ud83d" })).toEqual({ path: "name", problem: "surrogate" });
    expect(badTextPath({ ["k\u0000"]: 1 })).toEqual({ path: "k\u0000", problem: "nul" });
  });
});

describe("readBodyText", () => {
  it("stops reading a body without Content-Length as soon as it passes the cap", async () => {
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled++;
        controller.enqueue(new Uint8Array(1024));
      },
    });
    const request = new Request("http://x/", { method: "POST", body, duplex: "half" } as RequestInit);
    await expect(readBodyText(request, 4096)).rejects.toThrow("4 KiB (4096 bytes)");
    expect(pulled).toBeLessThan(10);
  });
});
