/**
 * `npm run -s predict -- --topology colpitts L=100u C1=1n C2=4n7 [--tol C=5% L=10%] [--measured 412.3k] …`
 * Predicts an oscillator's frequency with its tolerance bands; with a measurement, the drift and what it implies;
 * with a target, the standard-value change that gets there. Bad input: exit code 2, one line on stderr.
 */

import {
  E_SERIES_NAMES,
  TOPOLOGIES,
  TOPOLOGY_PARTS,
  buildDesignReport,
  formatEngineering,
  limitProblem,
  parseTempco,
  parseTolerance,
  parseValue,
  temperatureShift,
  validateDesign,
  type DesignReport,
  type ESeriesName,
  type OscillatorDesign,
  type PartSpec,
  type TemperatureShift,
  type Topology,
} from "../lib/oscillator/index";

const USAGE = `Usage: npm run -s predict -- --topology tank|colpitts|hartley|clapp PART=VALUE… [options]

Parts (values as written on the bench: 100u, 4n7, 4.7 nF, 470p, 10µH, R47):
  tank      L C
  colpitts  L C1 C2          C1 on the amplifier output (collector/drain) side, C2 on its input side
  clapp     L C1 C2 C3       C3 in series with L
  hartley   L1 L2 C [M=… | k=…]   L1 on the output side; M mutual inductance (H) or k coupling (0..1)

Options:
  --extra-c VALUE         known capacitance across the tank (stray, probe input, trimmer), e.g. 3p
  --tol REF=TOL …         part tolerances: 5%, ±5 %, 50ppm or a letter F G J K M. On a topology with C1/C2/C3,
                          C=… applies to every capacitor; on a Hartley, L=… applies to L1 and L2. A named part
                          (C2=1%) overrides the group. Put part values before --tol.
  --tempco REF=TC …       part tempcos: ±30ppm/°C, -750ppm/K, N750, C0G (same grouping as --tol)
  --delta-t KELVIN        temperature change for the tempco shift, e.g. 40 or -25
  --measured FREQ         measured frequency, e.g. 412.3k: drift and implied capacitance
  --target FREQ           wanted frequency, e.g. 400k: the single standard-value change that gets closest
  --series E12|E24        series for the retune (also E6, E48, E96); default E12
  --part REF              retune only this part (default: the best capacitor)
  --windings aiding|opposing   Hartley winding sense; default aiding
  --seed N, --trials N    Monte Carlo seed (default 1) and number of simulated builds (default 20000)
  --json                  print one JSON object instead of text
  --help                  print this help

Bands: worst case = the extremes over every tolerance corner; statistical = the central 99.7 % of a seeded Monte
Carlo run with each tolerance taken as 3 sigma of a normal spread (truncated at the tolerance); RSS = linear
root-sum-square, ±3 sigma.`;

class UsageError extends Error {}

interface Parsed {
  json: boolean;
  help: boolean;
  design: OscillatorDesign;
  measuredHz?: number;
  targetHz?: number;
  series?: ESeriesName;
  part?: string;
  seed?: number;
  trials?: number;
  deltaTK?: number;
}

function unitFor(topology: Topology, ref: string): "F" | "H" | undefined {
  const role = TOPOLOGY_PARTS[topology][ref];
  if (!role) {
    throw new UsageError(`part ${ref} is not used by ${topology} (its parts are ${Object.keys(TOPOLOGY_PARTS[topology]).join(", ")})`);
  }
  return role.kind === "capacitance" ? "F" : role.kind === "inductance" ? "H" : undefined;
}

/** Which parts a REF in --tol/--tempco stands for: itself, or the group C/L where no such part exists. */
function groupMembers(topology: Topology, ref: string): string[] {
  const roles = TOPOLOGY_PARTS[topology];
  if (ref in roles) return [ref];
  const kind = ref === "C" ? "capacitance" : ref === "L" ? "inductance" : undefined;
  if (kind) return Object.keys(roles).filter((r) => roles[r].kind === kind && r !== "M");
  unitFor(topology, ref);
  return [];
}

function splitAssignment(token: string, context: string): [string, string] {
  const eq = token.indexOf("=");
  if (eq <= 0) throw new UsageError(`expected REF=VALUE ${context}; got "${token}"`);
  return [token.slice(0, eq), token.slice(eq + 1)];
}

function parseArgs(argv: string[]): Parsed {
  const args = argv[0] === "--" ? argv.slice(1) : argv;
  let topology: Topology | undefined;
  const values: [string, string][] = [];
  const tolerances: [string, string][] = [];
  const tempcos: [string, string][] = [];
  const out: Omit<Parsed, "design"> & { extra?: string; windings?: string } = { json: false, help: false };
  const optionValue = (i: number, name: string): string => {
    const v = args[i + 1];
    if (v === undefined || v.startsWith("--")) throw new UsageError(`${name} needs a value`);
    return v;
  };

  for (let i = 0; i < args.length; i++) {
    let token = args[i];
    let inline: string | undefined;
    if (token.startsWith("--") && token.includes("=") && !["--tol", "--tempco"].includes(token.split("=")[0])) {
      [token, inline] = [token.slice(0, token.indexOf("=")), token.slice(token.indexOf("=") + 1)];
    }
    const take = (name: string): string => {
      if (inline !== undefined) return inline;
      const v = optionValue(i, name);
      i++;
      return v;
    };
    switch (token) {
      case "--help":
      case "-h":
        out.help = true;
        break;
      case "--json":
        out.json = true;
        break;
      case "--topology": {
        const t = take(token);
        if (!TOPOLOGIES.includes(t as Topology)) throw new UsageError(`--topology must be one of ${TOPOLOGIES.join(", ")}; got "${t}"`);
        topology = t as Topology;
        break;
      }
      case "--extra-c":
        out.extra = take(token);
        break;
      case "--measured":
      case "--target": {
        const hz = parseValue(take(token), "Hz");
        const problem = limitProblem("frequencyHz", hz, token === "--measured" ? "--measured" : "--target");
        if (problem) throw new UsageError(problem);
        if (token === "--measured") out.measuredHz = hz;
        else out.targetHz = hz;
        break;
      }
      case "--series": {
        const s = take(token).toUpperCase();
        if (!E_SERIES_NAMES.includes(s as ESeriesName)) throw new UsageError(`--series must be one of ${E_SERIES_NAMES.join(", ")}; got "${s}"`);
        out.series = s as ESeriesName;
        break;
      }
      case "--part":
        out.part = take(token);
        break;
      case "--windings":
        out.windings = take(token);
        break;
      case "--seed":
      case "--trials":
      case "--delta-t": {
        const text = take(token);
        const n = Number(text);
        if (text.trim() === "" || !Number.isFinite(n)) throw new UsageError(`${token} needs a number; got "${text}"`);
        if (token === "--seed") out.seed = n;
        else if (token === "--trials") out.trials = n;
        else {
          const problem = limitProblem("temperatureChangeK", n, "--delta-t (the temperature change from 25 °C)");
          if (problem) throw new UsageError(problem);
          out.deltaTK = n;
        }
        break;
      }
      case "--tol":
      case "--tempco": {
        const list = token === "--tol" ? tolerances : tempcos;
        let count = 0;
        while (i + 1 < args.length && !args[i + 1].startsWith("--")) {
          list.push(splitAssignment(args[++i], `after ${token}`));
          count++;
        }
        if (count === 0) throw new UsageError(`${token} needs at least one REF=VALUE`);
        break;
      }
      default:
        if (token.startsWith("-")) throw new UsageError(`unknown option ${token} (see --help)`);
        values.push(splitAssignment(token, "for a part value"));
    }
  }
  if (out.help) return { ...out, design: { topology: "tank", parts: {} } };
  if (!topology) throw new UsageError("--topology is required (tank, colpitts, hartley or clapp)");

  const parts: Record<string, PartSpec> = {};
  for (const [ref, text] of values) {
    const unit = unitFor(topology, ref);
    if (ref in parts) throw new UsageError(`part ${ref} is given twice`);
    parts[ref] = { valueSi: unit ? parseValue(text, unit) : parseValue(text) };
  }
  // Groups first, then named parts, so C2=1% wins over C=5% whatever the order on the line.
  const applyAll = <T>(list: [string, string][], read: (text: string) => T, set: (part: PartSpec, v: T) => void): void => {
    const ordered = [...list].sort(([a], [b]) => Number(a in TOPOLOGY_PARTS[topology]) - Number(b in TOPOLOGY_PARTS[topology]));
    for (const [ref, text] of ordered) {
      const v = read(text);
      for (const member of groupMembers(topology, ref)) {
        if (parts[member]) set(parts[member], v);
        else if (ref === member) throw new UsageError(`part ${ref} has a tolerance or tempco but no value`);
      }
    }
  };
  applyAll(tolerances, parseTolerance, (p, t) => (p.tolerance = t));
  applyAll(tempcos, parseTempco, (p, t) => {
    p.tempcoPpmPerK = t.ppmPerK;
    p.tempcoSpreadPpmPerK = t.spreadPpmPerK;
  });

  const design: OscillatorDesign = { topology, parts };
  if (out.extra !== undefined) design.extraCapacitanceF = parseValue(out.extra, "F");
  if (out.windings !== undefined) design.windings = out.windings as OscillatorDesign["windings"];
  const problems = validateDesign(design);
  if (problems.length > 0) throw new UsageError(problems.join("; "));
  if (out.deltaTK !== undefined && tempcos.length === 0) throw new UsageError("--delta-t needs --tempco for at least one part");
  const { extra: _extra, windings: _windings, ...rest } = out;
  return { ...rest, design };
}

const eng = (value: number, unit: string, figures = 6): string => formatEngineering(value, unit, figures);
const part = (value: number, unit: string): string => formatEngineering(value, unit, 4, { trimZeros: true });
/** A frequency the user typed, shown without padding zeros it never had. */
const given = (value: number, unit: string): string => formatEngineering(value, unit, 9, { trimZeros: true });
const signed = (text: string): string => (text.startsWith("-") ? text : `+${text}`);
const percentOf = (value: number, reference: number): string => signed(`${(((value - reference) / reference) * 100).toFixed(3)} %`);

function wrap(text: string, indent: string, width = 100): string {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/)) {
    if (line !== "" && indent.length + line.length + 1 + word.length > width) {
      lines.push(indent + line);
      line = word;
    } else line = line === "" ? word : `${line} ${word}`;
  }
  if (line !== "") lines.push(indent + line);
  return lines.join("\n");
}

function describeParts(design: OscillatorDesign): string {
  return Object.entries(design.parts)
    .map(([ref, p]) => {
      const role = TOPOLOGY_PARTS[design.topology][ref];
      const unit = role.kind === "capacitance" ? "F" : role.kind === "inductance" ? "H" : "";
      const tolerance = p.tolerance ? ` ±${Number((p.tolerance * 100).toPrecision(6))} %` : "";
      const value = unit === "" ? String(Number(p.valueSi.toPrecision(4))) : part(p.valueSi, unit);
      return `${ref} = ${value}${tolerance}`;
    })
    .join(", ");
}

function humanReport(parsed: Parsed, report: DesignReport, temperature?: TemperatureShift): string {
  const { design } = parsed;
  const f0 = report.predictedHz;
  const title = design.topology[0].toUpperCase() + design.topology.slice(1);
  const out: string[] = [];
  const extra = design.extraCapacitanceF ? `, extra C = ${part(design.extraCapacitanceF, "F")}` : "";
  out.push(`${title}: ${describeParts(design)}${extra}`);
  out.push(`  C_eff ${eng(report.cEffF, "F", 5)}, L_eff ${eng(report.lEffH, "H", 5)}`);
  out.push(`  predicted f0         ${eng(f0, "Hz")}`);
  if (report.feedbackFraction !== null && report.minGain !== null) {
    out.push(`  feedback fraction    ${report.feedbackFraction.toPrecision(4)} (minimum start-up gain ${report.minGain.toPrecision(4)})`);
  }
  const band = (min: number, max: number): string =>
    `${eng(min, "Hz")} to ${eng(max, "Hz")}  (${percentOf(min, f0)} / ${percentOf(max, f0)})`;
  const w = report.worstCase;
  const s = report.statistical;
  if (w.corners > 1) {
    out.push(`  worst case           ${band(w.minHz, w.maxHz)}, ${w.corners} tolerance corners`);
    out.push(`  statistical 99.7 %   ${band(s.minHz, s.maxHz)}, Monte Carlo ${s.trials} builds, seed ${s.seed}`);
    out.push(
      report.rss.meaningful
        ? `  RSS ±3 sigma         ${band(report.rss.minHz, report.rss.maxHz)}`
        : "  RSS ±3 sigma         not meaningful here: the linear band reaches 0 Hz (tolerances too wide for it)",
    );
  } else {
    out.push("  no tolerances given (add --tol C=5% L=10%) so there is no band");
  }
  if (report.bandWarning) out.push(wrap(`warning: ${report.bandWarning}`, "  "));
  if (temperature) {
    out.push(
      `Temperature ${signed(String(temperature.temperatureChangeK))} K: f0 ${eng(temperature.shiftedHz, "Hz")} ` +
        `(${signed((temperature.exactFraction * 1e6).toFixed(1))} ppm exact, ${signed((temperature.linearFraction * 1e6).toFixed(1))} ppm linear)`,
    );
    if (temperature.minHz !== temperature.maxHz) {
      out.push(`  over the tempco spreads ${eng(temperature.minHz, "Hz")} to ${eng(temperature.maxHz, "Hz")}`);
    }
  }
  if (report.drift) {
    const d = report.drift;
    out.push(
      `Measured ${given(d.measuredHz, "Hz")}: drift ${signed(eng(d.hz, "Hz", 5))} (${signed(`${d.percent.toFixed(3)} %`)}, ${signed(d.ppm.toFixed(0))} ppm)`,
    );
    out.push(`  implied extra capacitance  ${signed(eng(d.impliedExtraCapacitanceF, "F", 4))} (equivalent parallel)`);
    out.push(`  or inductance error        ${signed(eng(d.impliedInductanceErrorH, "H", 4))} (${signed(`${d.impliedInductanceErrorPercent.toFixed(3)} %`)})`);
    out.push(wrap(d.explanation, "  "));
  }
  if (report.retune) {
    const r = report.retune;
    const basis = report.drift ? "measured drift taken as real" : "model only, no measurement";
    const change = r.changed
      ? `change ${r.part} ${part(r.fromSi, r.unit)} -> ${part(r.toSi, r.unit)}`
      : `keep ${r.part} at ${part(r.fromSi, r.unit)}: no single ${r.series} value comes closer`;
    out.push(`Retune to ${given(r.targetHz, "Hz")} (${r.series}, ${basis}): ${change}`);
    if (!r.reachable && r.unreachableReason) out.push(wrap(`cannot be reached: ${r.unreachableReason}`, "  "));
    if (r.idealSi !== null) out.push(`  exact value for the target would be ${eng(r.idealSi, r.unit, 4)}`);
    out.push(`  predicted ${eng(r.predictedHz, "Hz")} (${percentOf(r.predictedHz, r.targetHz)} from target)`);
    if (r.changed && r.feedbackFraction !== null && r.minGain !== null && r.feedbackFraction !== report.feedbackFraction) {
      out.push(`  feedback fraction becomes ${r.feedbackFraction.toPrecision(4)} (minimum start-up gain ${r.minGain.toPrecision(4)})`);
    }
    if (r.changed && r.startupWarning) out.push(wrap(`warning: ${r.startupWarning}`, "  "));
    if (w.corners > 1) {
      out.push(`  worst case ${eng(r.worstCase.minHz, "Hz")} to ${eng(r.worstCase.maxHz, "Hz")}, statistical ${eng(r.statistical.minHz, "Hz")} to ${eng(r.statistical.maxHz, "Hz")}`);
    }
  }
  out.push(wrap(`Assumptions: ${report.assumptions}`, ""));
  return out.join("\n");
}

function main(argv: string[]): number {
  let text: string;
  try {
    const parsed = parseArgs(argv);
    if (parsed.help) {
      process.stdout.write(`${USAGE}\n`);
      return 0;
    }
    const report = buildDesignReport(parsed.design, {
      measuredHz: parsed.measuredHz,
      targetHz: parsed.targetHz,
      series: parsed.series,
      part: parsed.part,
      statistical: { seed: parsed.seed, trials: parsed.trials },
    });
    const temperature = parsed.deltaTK === undefined ? undefined : temperatureShift(parsed.design, parsed.deltaTK);
    text = parsed.json
      ? JSON.stringify({ design: parsed.design, ...report, ...(temperature ? { temperature } : {}) }, null, 2)
      : humanReport(parsed, report, temperature);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const known = error instanceof UsageError || error instanceof RangeError || error instanceof TypeError;
    process.stderr.write(`predict: ${message.replace(/\s*\n\s*/g, " ")}${known ? "" : " (unexpected error)"}\n`);
    return known ? 2 : 1;
  }
  process.stdout.write(`${text}\n`);
  return 0;
}

process.exitCode = main(process.argv.slice(2));
