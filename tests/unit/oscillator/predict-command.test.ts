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

  it("prints usage for --help", () => {
    const { code, stdout } = predict("--help");
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Usage: npm run -s predict/);
    expect(stdout).toMatch(/C=… applies to every capacitor/);
  });
});
