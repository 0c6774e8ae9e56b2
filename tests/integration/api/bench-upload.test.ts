import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { api, appUrl, captureCsv, createFixture, type Fixture } from "./helpers";

const root = path.resolve(import.meta.dirname, "../../..");
const script = path.join(root, "scripts/bench-upload.mjs");

let fx: Fixture;
let tmp: string;

interface Outcome {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs the bench script as a bench PC would: plain node, no tsx, no project imports. */
function bench(args: string[], env: Record<string, string> = {}): Promise<Outcome> {
  return new Promise((resolve) => {
    execFile(
      process.execPath,
      [script, ...args],
      { cwd: tmp, env: { PATH: process.env.PATH ?? "", ...env } as unknown as NodeJS.ProcessEnv, timeout: 150_000, encoding: "utf8" },
      (err: Error | null, stdout: string, stderr: string) => {
        resolve({ code: err ? Number((err as Error & { code?: number }).code ?? 1) : 0, stdout, stderr });
      },
    );
  });
}

function file(name: string, text: string): string {
  const p = path.join(tmp, name);
  writeFileSync(p, text);
  return p;
}

beforeAll(async () => {
  tmp = mkdtempSync(path.join(tmpdir(), "tankbook-bench-"));
  fx = await createFixture("bench");
});

afterAll(async () => {
  rmSync(tmp, { recursive: true, force: true });
  await closeDb();
  await closeLucia();
});

describe("scripts/bench-upload.mjs", () => {
  it("uploads_waits_and_prints_frequency_drift_and_verdict_with_exit_0", async () => {
    const capture = file("after-c2.csv", captureCsv(410e3, 501));
    const out = await bench(["--url", appUrl(), "--token", fx.team.technician.token, "--build", fx.buildId, capture, "--note", "from the bench", "--channel", "Out"]);
    expect(out.code, out.stderr).toBe(0);
    const lines = out.stdout.trim().split("\n");
    expect(lines).toHaveLength(3);
    expect(lines[0]).toMatch(/^measured frequency: 409\.9\d+ kHz ± /);
    expect(lines[1]).toMatch(/^drift: -\d+\.\d ppm against the predicted 411\.1\d* kHz$/);
    expect(lines[2]).toBe("verdict: pass");
    const runId = /as run ([0-9a-f-]{36})/.exec(out.stderr)?.[1];
    const run = await api("get", `/api/v1/runs/${runId}`, fx.team.viewer);
    expect(run.body).toMatchObject({ note: "from the bench", channel: "Out", status: "done" });
    expect(lines[1]).toContain(`${run.body.driftPpm.toFixed(1)} ppm`);
  });

  it("takes_the_token_from_TANKBOOK_TOKEN_and_exits_1_with_the_reason_when_the_analysis_fails", async () => {
    const tooShort = file("short.csv", "Time (s),Out (V)\n0,0.1\n1e-8,0.2\n2e-8,0.1\n");
    const out = await bench(["--url", appUrl(), "--build", fx.buildId, tooShort], { TANKBOOK_TOKEN: fx.team.technician.token });
    expect(out.code, out.stderr).toBe(1);
    expect(out.stdout).toMatch(/^analysis failed: .*samples/);
  });

  it("exits_2_with_the_problem_detail_for_a_bad_token_a_viewer_or_a_duplicate", async () => {
    const capture = file("dup.csv", captureCsv(410e3, 502));
    const badToken = await bench(["--url", appUrl(), "--token", `tbk_${"B".repeat(43)}`, "--build", fx.buildId, capture]);
    expect(badToken.code).toBe(2);
    expect(badToken.stderr).toMatch(/HTTP 401/);
    const viewer = await bench(["--url", appUrl(), "--token", fx.team.viewer.token, "--build", fx.buildId, capture]);
    expect(viewer.code).toBe(2);
    expect(viewer.stderr).toMatch(/HTTP 403 .*technician/);
    expect((await bench(["--url", appUrl(), "--token", fx.team.technician.token, "--build", fx.buildId, capture])).code).toBe(0);
    const again = await bench(["--url", appUrl(), "--token", fx.team.technician.token, "--build", fx.buildId, capture]);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/HTTP 409 .*already logged/);
  });

  it("exits_2_for_bad_usage_a_missing_file_and_an_unreachable_server", async () => {
    const usage = await bench([]);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toMatch(/usage: node scripts\/bench-upload\.mjs/);
    expect((await bench(["--url", appUrl(), "--token", "t", "--build", fx.buildId, "--timeout", "soon", "x.csv"])).stderr).toMatch(/--timeout/);
    const missing = await bench(["--url", appUrl(), "--token", "t", "--build", fx.buildId, "nothing-here.csv"]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/no such file/);
    const capture = file("offline.csv", captureCsv(410e3, 503));
    // Port 9 (discard) on loopback has no listener on a test machine.
    const offline = await bench(["--url", "http://127.0.0.1:9", "--token", "t", "--build", fx.buildId, capture]);
    expect(offline.code).toBe(2);
    expect(offline.stderr).toMatch(/cannot reach/);
  });
});
