import { formatEngineering } from "../../oscillator/units";
import type { StabilityEnvelope } from "./types";

/**
 * The measured transient in words, for the not-steady warning: the warning keeps its code (a spec
 * still fails a record that is not steady) and gains the figure, or says why there is none.
 */
export function describeTransient(envelope: StabilityEnvelope | undefined): string | null {
  if (!envelope) return null;
  if (envelope.kind === "start-up") {
    const parts: string[] = [];
    if (envelope.startUpS !== null && envelope.settledVpk !== null) {
      parts.push(`start-up measured: 90 % of the settled ${formatEngineering(envelope.settledVpk, "V", 3)} peak ${formatEngineering(envelope.startUpS, "s", 3)} after the oscillation appears`);
    } else parts.push("a start-up");
    if (envelope.growthPerS !== null) parts.push(`envelope growth ${envelope.growthPerS.toPrecision(3)} /s`);
    const text = parts.join(", ");
    return envelope.reason ? `${text} (${envelope.reason})` : text;
  }
  if (envelope.kind === "ring-down") {
    if (envelope.decayTauS !== null && envelope.decayTauSigmaS !== null && envelope.q !== null && envelope.qSigma !== null) {
      return `ring-down measured: decay time constant ${formatEngineering(envelope.decayTauS, "s", 4)} ± ${formatEngineering(envelope.decayTauSigmaS, "s", 2)}, Q = ${envelope.q.toPrecision(4)} ± ${envelope.qSigma.toPrecision(2)}`;
    }
    return `a ring-down (${envelope.reason ?? "not measured"})`;
  }
  return envelope.reason ? `no start-up or ring-down figure: ${envelope.reason}` : null;
}
