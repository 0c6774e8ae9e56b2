import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "../../..");

function analyze(args: string[]) {
  const result = spawnSync(path.join(root, "node_modules/.bin/tsx"), [path.join(root, "scripts/analyze.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe("analyze --help", () => {
  it.each([["--help"], ["-h"]])("prints the usage and every option on stdout with status 0 for %s", (flag) => {
    const out = analyze([flag]);
    expect(out.status).toBe(0);
    expect(out.stderr).toBe("");
    expect(out.stdout).toMatch(/^usage: analyze FILE/);
    for (const option of ["--channel", "--harmonics", "--probe", "--json"]) expect(out.stdout).toContain(`  ${option}`);
  });

  it("still refuses an unknown option with status 2", () => {
    const out = analyze(["--frobnicate"]);
    expect(out.status).toBe(2);
    expect(out.stderr).toContain("unknown option '--frobnicate'");
  });
});
