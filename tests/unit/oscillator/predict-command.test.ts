import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { expectRel } from "./expect-close";

const root = path.resolve(import.meta.dirname, "../../..");

function predict(...args: string[]) {
  const result = spawnSync(process.execPath, ["--import", "tsx", "scripts/predict.ts", ...args], {
    cwd: root,
    encoding: "utf8",
    env: { ...process.env, NO_COLOR: "1" },
  });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe("predict command", () => {
  it("prints the JSON contract", () => {
    const { code, stdout, stderr } = predict(
      "--topology", "colpitts", "L=100u", "C1=1n", "C2=4n7",
      "--tol", "C=5%", "L=10%", "--measured", "412.3k", "--target", "400k", "--series", "E12", "--json",
    );
    expect(stderr).toBe("");
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    for (const key of ["predictedHz", "cEffF", "lEffH", "feedbackFraction", "minGain"]) expect(typeof out[key]).toBe("number");
    expect(Object.keys(out.worstCase)).toEqual(expect.arrayContaining(["minHz", "maxHz"]));
    expect(Object.keys(out.statistical)).toEqual(expect.arrayContaining(["minHz", "maxHz"]));
    expect(Object.keys(out.drift)).toEqual(
      expect.arrayContaining(["hz", "percent", "ppm", "impliedExtraCapacitanceF", "impliedInductanceErrorH"]),
    );
    expect(Object.keys(out.retune)).toEqual(expect.arrayContaining(["part", "fromF", "toF", "predictedHz"]));
    // C1 = 1 nF, C2 = 4.7 nF in series: 824.561 pF [derived]; C=5% reached both capacitors.
    expectRel(out.cEffF, (1e-9 * 4.7e-9) / 5.7e-9, 1e-12);
    expect(out.design.parts.C1.tolerance).toBe(0.05);
    expect(out.design.parts.C2.tolerance).toBe(0.05);
    expect(out.design.parts.L.tolerance).toBe(0.1);
    expect(out.worstCase.minHz).toBeLessThan(out.predictedHz);
  });

  it("prints the prediction, bands, drift and retune as text", () => {
    const { code, stdout } = predict(
      "--topology", "colpitts", "L=100u", "C1=1n", "C2=4n7", "--extra-c", "3p",
      "--tol", "C=5%", "C2=1%", "--measured", "412.3k", "--target", "400k",
    );
    expect(code).toBe(0);
    expect(stdout).toMatch(/predicted f0 +\d/);
    expect(stdout).toMatch(/worst case/);
    expect(stdout).toMatch(/statistical 99\.7 %/);
    expect(stdout).toMatch(/implied extra capacitance/);
    expect(stdout).toMatch(/Retune to 400 kHz/);
    expect(stdout).toMatch(/C1 = 1 nF ±5 %, C2 = 4\.7 nF ±1 %, extra C = 3 pF/);
  });

  it("lets a named tolerance win over its group whatever the order, and reports the tempco shift", () => {
    const { code, stdout } = predict(
      "--topology", "clapp", "L=100u", "C1=1n", "C2=2n2", "C3=100p",
      "--tol", "C3=1%", "C=5%", "--tempco", "C=C0G", "--delta-t", "40", "--json",
    );
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.design.parts.C3.tolerance).toBe(0.01);
    expect(out.design.parts.C1.tolerance).toBe(0.05);
    expect(out.design.parts.L.tolerance).toBeUndefined();
    expect(out.temperature.temperatureChangeK).toBe(40);
    expect(out.temperature.minHz).toBeLessThan(out.predictedHz);
    expect(out.temperature.maxHz).toBeGreaterThan(out.predictedHz);
  });

  it("refuses bad input with one line on stderr and nothing on stdout", () => {
    for (const args of [
      ["--topology", "colpitts", "L=100u", "C1=1n", "C2=4.7q"],
      ["--topology", "colpitts", "L=100u", "C1=1n"],
      ["--topology", "pierce", "L=1u"],
      ["L=100u", "C=1n"],
      ["--topology", "tank", "L=100u", "C=1n", "--tol", "C=5"],
      ["--topology", "tank", "L=100u", "C=4.7 nH"],
      ["--topology", "tank", "L=100u", "C=1n", "--bogus"],
      ["--topology", "tank", "L=100u", "C=1n", "--measured"],
      ["--topology", "tank", "L=100u", "C=1n", "--measured", "-5k"],
      ["--topology", "colpitts", "L=100u", "C1=1n", "C2=1n", "--tol", "C3=5%"],
      ["--topology", "tank", "L=100u", "C=1n", "--target", "1M", "--part", "C7"],
    ]) {
      const { code, stdout, stderr } = predict(...args);
      expect(code, args.join(" ")).toBe(2);
      expect(stdout).toBe("");
      expect(stderr.trimEnd().split("\n"), stderr).toHaveLength(1);
      expect(stderr).toMatch(/^predict: /);
      expect(stderr).not.toMatch(/\bat .*\.ts:\d+/);
    }
  });

  it("names the bad value", () => {
    expect(predict("--topology", "colpitts", "L=100u", "C1=1n", "C2=4.7q").stderr).toMatch(/"4\.7q" is not a value/);
  });

  it("refuses values no bench holds, in engineering notation with the unit", () => {
    // Issue 12's reproductions: each is exit code 2 with one line naming the limit.
    const cases: [string[], RegExp][] = [
      [["--topology", "tank", "L=1e30", "C=1n"], /part L \(tank inductor\) must be from 1 nH to 10 H; got 1e30 H/],
      [["--topology", "tank", "L=10u", "C=1n", "--tempco", "C=N750", "--delta-t", "-2000"], /--delta-t .* got -2000 K \(that is at or below absolute zero\)/],
      [["--topology", "tank", "L=10u", "C=1n", "--target", "1e30"], /--target must be from 100 mHz to 20 GHz; got 1e30 Hz/],
      [["--topology", "tank", "L=1f", "C=1f"], /got 1 fH; part C .* got 1 fF/],
    ];
    for (const [args, message] of cases) {
      const { code, stdout, stderr } = predict(...args);
      expect(code, args.join(" ")).toBe(2);
      expect(stdout).toBe("");
      expect(stderr).toMatch(message);
      expect(stderr).not.toMatch(/\d\.\d{8,}/);
    }
  });

  it("reports a tolerance corner that cancels a Hartley's inductance and still prints the prediction", () => {
    const { code, stdout, stderr } = predict(
      "--topology", "hartley", "L1=10u", "L2=10u", "k=0.99", "C=1n", "--windings", "opposing", "--tol", "L=10%", "k=5%",
    );
    expect(stderr).toBe("");
    expect(code).toBe(0);
    // L_eff = 20 µH − 2·0.99·10 µH = 200 nH [derived], f0 = 1/(2π√(200 nH · 1 nF)) = 11.2540 MHz.
    expect(stdout).toMatch(/predicted f0 {9}11\.2540 MHz/);
    expect(stdout.replace(/\s+/g, " ")).toMatch(/warning: 2 of 8 tolerance corners make the model invalid/);
    // σ_f/f is so large here that f0·(1 − 3σ) is below 0 Hz: a negative frequency is never printed.
    expect(stdout).toMatch(/RSS ±3 sigma {9}not meaningful here/);
    expect(stdout).not.toMatch(/ -\d[\d.]* [kMG]?Hz/);
  });

  it("says when a retune target cannot be reached, with the nearest reachable frequency", () => {
    const { code, stdout } = predict("--topology", "clapp", "L=100u", "C1=1n", "C2=1n", "C3=100p", "--target", "500k");
    expect(code).toBe(0);
    const text = stdout.replace(/\s+/g, " ");
    expect(text).toMatch(/cannot be reached: the 500 kHz target cannot be reached/);
    expect(text).toMatch(/nearest reachable frequency is 713\.540 kHz/);
  });

  it("accepts decimal commas in part values", () => {
    const { code, stdout } = predict("--topology", "tank", "L=10u", "C=4,7n", "--json");
    expect(code).toBe(0);
    expect(JSON.parse(stdout).design.parts.C.valueSi).toBe(4.7e-9);
  });

  it("prints usage for --help", () => {
    const { code, stdout } = predict("--help");
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Usage: npm run -s predict/);
    expect(stdout).toMatch(/C=… applies to every capacitor/);
  });
});
