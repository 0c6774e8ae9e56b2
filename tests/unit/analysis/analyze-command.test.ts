import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { synthCaptureCsv } from "../../helpers/signals";

const root = path.resolve(import.meta.dirname, "../../..");
const dir = mkdtempSync(path.join(tmpdir(), "tankbook-analyze-"));
const good = path.join(dir, "good.csv");
const bad = path.join(dir, "bad.csv");
writeFileSync(
  good,
  synthCaptureCsv({
    frequencyHz: 98_765.4321,
    sampleRateHz: 10e6,
    samples: 20_000,
    amplitudeV: 0.9,
    harmonicsDbc: [-35, -45],
    noiseVrms: 0.001,
    dcV: -0.2,
    seed: 5,
    second: { name: "Base", gainDb: -12, phaseDeg: 175 },
  }),
);
writeFileSync(bad, `Time (s),Out (V)\n${Array.from({ length: 100 }, (_, i) => `${i * 1e-6},${i === 60 ? "abc" : "0.1"}`).join("\n")}\n`);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// The command as package.json runs it today (tsx), and the launcher-free path (scripts/run-analyze.mjs).
const LAUNCHERS: [string, string[]][] = [
  ["tsx scripts/analyze.ts", [path.join(root, "node_modules/.bin/tsx"), path.join(root, "scripts/analyze.ts")]],
  ["node scripts/run-analyze.mjs", [process.execPath, path.join(root, "scripts/run-analyze.mjs")]],
];

function run(command: string[], args: string[]) {
  const result = spawnSync(command[0], [...command.slice(1), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe.each(LAUNCHERS)("analyze command via %s", (_name, command) => {
  it("prints one JSON object with the contract's fields in SI units for --json", () => {
    const { status, stdout, stderr } = run(command, [good, "--json", "--harmonics", "5"]);
    expect(stderr).toBe("");
    expect(status).toBe(0);
    expect(stdout.trim().split("\n")).toHaveLength(1);
    const result = JSON.parse(stdout);
    for (const key of ["channel", "samples", "sampleRateHz", "frequencyHz", "frequencyUncertaintyHz", "fundamentalVpk", "vpp", "vrms", "dcV", "thdPercent", "thdDb", "sinadDb", "snrDb", "sfdrDb", "harmonics", "warnings"]) {
      expect(result).toHaveProperty(key);
    }
    expect(result.channel).toBe("Out");
    expect(result.samples).toBe(20_000);
    expect(result.frequencyHz).toBeCloseTo(98_765.4321, 1);
    expect(result.harmonics.map((h: { order: number }) => h.order)).toEqual([2, 3, 4, 5]);
    expect(result.harmonics[0]).toEqual({
      order: 2,
      frequencyHz: expect.any(Number),
      seenAtHz: expect.any(Number),
      folded: false,
      status: "measured",
      amplitudeVpk: expect.any(Number),
      dBc: expect.any(Number),
      detectionLimitDbc: expect.any(Number),
      note: null,
    });
    expect(result).not.toHaveProperty("plot");
  });

  it("analyses the channel named by --channel and prints a table without --json", () => {
    const { status, stdout } = run(command, [good, "--channel", "Base"]);
    expect(status).toBe(0);
    expect(stdout).toMatch(/^channel +Base \(20000 samples/);
    expect(stdout).toMatch(/\nfrequency +98\.765\d+ kHz ± /);
  });

  it("rejects bad input with one line on stderr, nothing on stdout and a non-zero status", () => {
    const { status, stdout, stderr } = run(command, [bad, "--json"]);
    expect(status).toBe(1);
    expect(stdout).toBe("");
    expect(stderr).toBe("analyze: line 62: 'abc' is not a number in column Out (V)\n");
  });

  it("names a missing file, an unknown channel and bad usage in one line each", () => {
    const missing = run(command, [path.join(dir, "nope.csv")]);
    expect([missing.status, missing.stdout, missing.stderr]).toEqual([1, "", `analyze: cannot read ${path.join(dir, "nope.csv")}: no such file\n`]);
    const channel = run(command, [good, "--channel", "Emitter"]);
    expect([channel.status, channel.stderr]).toEqual([1, "analyze: no channel named 'Emitter'; the capture has Out, Base\n"]);
    const usage = run(command, ["--harmonics", "zero"]);
    expect(usage.status).toBe(2);
    expect(usage.stderr.trim().split("\n")).toHaveLength(1);
  });
});
