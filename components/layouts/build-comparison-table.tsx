import Link from "next/link";
import { TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { DASH, formatDecibels, formatDriftLeading, formatPercent, formatQuantity, formatSignedCapacitance } from "@/lib/format/numbers";
import type { ComparedBuild } from "@/lib/layouts/build-comparison";

export interface BuildComparisonTableProps {
  builds: ComparedBuild[];
}

const TREND_WORDS: Record<ComparedBuild["trend"]["verdict"], { icon: string; word: string }> = {
  steady: { icon: "═", word: "Steady" },
  changing: { icon: "↕", word: "Changing" },
  untested: { icon: "?", word: "Untested" },
  "too-few-runs": { icon: "…", word: "Too few runs" },
};

const link = "underline-offset-2 hover:text-copper hover:underline";

/** Builds as columns, figures as rows, so a phone scrolls sideways through builds rather than squeezing numbers. */
export function BuildComparisonTable({ builds }: BuildComparisonTableProps) {
  const anyStability = builds.some((b) => b.stability.measured);
  const orders = [...new Set(builds.flatMap((b) => b.latestRun?.harmonics.map((h) => h.order) ?? []))].sort((a, b) => a - b).slice(0, 8);
  const row = (label: string, cell: (b: ComparedBuild) => React.ReactNode, numeric = true) => (
    <Tr>
      <Td className="whitespace-nowrap text-ink-soft">{label}</Td>
      {builds.map((b) => (
        <Td key={b.build.id} numeric={numeric}>
          {cell(b)}
        </Td>
      ))}
    </Tr>
  );
  return (
    <Table caption="Builds compared: the chosen run of each (by default the newest not withdrawn)">
      <thead>
        <tr>
          <Th>Figure</Th>
          {builds.map((b) => (
            <Th key={b.build.id} className="min-w-[10rem] text-right">
              <Link className={`text-ink ${link}`} href={`/builds/${b.build.id}`}>
                {b.build.label}
              </Link>
              <span className="block font-normal">{b.constructionName}</span>
            </Th>
          ))}
        </tr>
      </thead>
      <tbody>
        {row(
          "Design",
          (b) => (
            <Link className={link} href={`/projects/${b.build.projectId}/designs/${b.build.designId}`}>
              {b.build.designName} · {TOPOLOGY_NAMES[b.build.topology]}
            </Link>
          ),
          false,
        )}
        {row(
          "Compared run",
          (b) =>
            b.latestRun ? (
              <>
                <Link className={link} href={`/runs/${b.latestRun.id}`}>
                  {b.latestRun.originalFilename}
                </Link>
                <span className="block text-[11px] text-ink-faint">
                  {b.runChosen ? "chosen" : "newest not withdrawn"}
                  {b.latestRun.withdrawnAt ? (
                    <>
                      {" · "}
                      <span className="font-medium text-ink-soft" data-withdrawn="true">
                        <span aria-hidden="true">⊘ </span>withdrawn
                      </span>
                    </>
                  ) : null}
                </span>
              </>
            ) : b.runChoices.length > 0 ? (
              "every analysed run is withdrawn"
            ) : (
              "no analysed run yet"
            ),
          false,
        )}
        {row("Measured", (b) =>
          b.latestRun?.measuredHz != null ? (
            <>
              {formatQuantity(b.latestRun.measuredHz, "Hz", 7)}
              {b.latestRun.frequencyUncertaintyHz != null ? (
                <span className="block text-[11px] text-ink-faint">± {formatQuantity(b.latestRun.frequencyUncertaintyHz, "Hz", 2)}</span>
              ) : null}
            </>
          ) : (
            DASH
          ),
        )}
        {row("Predicted", (b) => formatQuantity(b.latestRun?.predictedHz, "Hz", 7))}
        {row("Measured − predicted", (b) => formatQuantity(b.offsetHz, "Hz", 4, { signed: true }))}
        {row("Drift", (b) => formatDriftLeading(b.latestRun?.driftPpm).main)}
        {row("Implied extra C (latest)", (b) => formatSignedCapacitance(b.latestRun?.impliedExtraCapacitanceF))}
        {row(
          "Implied C trend",
          (b) => (
            <span title={b.trend.summary}>
              <span aria-hidden="true">{TREND_WORDS[b.trend.verdict].icon} </span>
              {TREND_WORDS[b.trend.verdict].word}
              {b.trend.typicalF !== null ? <span className="block text-[11px] text-ink-faint">about {formatSignedCapacitance(b.trend.typicalF)}</span> : null}
            </span>
          ),
        )}
        {row("THD", (b) => formatPercent(b.latestRun?.thdPercent))}
        {orders.map((order) => (
          <Tr key={order}>
            <Td className="whitespace-nowrap text-ink-soft">H{order}</Td>
            {builds.map((b) => {
              const h = b.latestRun?.harmonics.find((x) => x.order === order);
              return (
                <Td key={b.build.id} numeric>
                  {h ? formatDecibels(h.dBc, "dBc") : DASH}
                </Td>
              );
            })}
          </Tr>
        ))}
        {anyStability ? (
          <>
            {row("rms jitter", (b) => <Stability b={b} value={jitterValue} why={(s) => s.jitterReason} />)}
            {row("Phase noise", (b) => <Stability b={b} value={phaseNoiseValue} why={() => "not measured on this capture"} />)}
            {row("Allan deviation", (b) => <Stability b={b} value={allanValue} why={() => "not measured on this capture"} />)}
          </>
        ) : (
          // No compared run holds stability figures: one row says so, not three.
          row("Stability", (b) => <Stability b={b} value={() => null} why={() => null} />)
        )}
        {row(
          "Trust warnings",
          (b) => (b.latestRun ? (b.latestRun.warningCodes.length > 0 ? `⚠ ${b.latestRun.warningCodes.join(", ")}` : "none") : DASH),
          false,
        )}
      </tbody>
    </Table>
  );
}

type StabilityFigures = ComparedBuild["stability"];

const jitterValue = (s: StabilityFigures) => (s.rmsJitterS !== null ? formatQuantity(s.rmsJitterS, "s", 3) : null);

/** Up to five offsets; a point at the capture's floor is an upper bound ("≤"), never a measurement. */
const phaseNoiseValue = (s: StabilityFigures) =>
  s.phaseNoise.length > 0 ? (
    <ul>
      {s.phaseNoise.slice(0, 5).map((p) => (
        <li key={p.offsetHz} className="whitespace-nowrap">
          {formatQuantity(p.offsetHz, "Hz", 3, { trimZeros: true })}: {p.atFloor ? "≤ " : ""}
          {formatDecibels(p.dbcPerHz, "dBc/Hz")}
        </li>
      ))}
    </ul>
  ) : null;

const allanValue = (s: StabilityFigures) =>
  s.allan.length > 0 ? (
    <ul>
      {s.allan.slice(0, 4).map((p) => (
        <li key={p.tauS} className="whitespace-nowrap">
          τ {formatQuantity(p.tauS, "s", 3, { trimZeros: true })}: {p.adev.toExponential(2).replace("-", "−")}
        </li>
      ))}
    </ul>
  ) : null;

/** One stability figure of a compared run, or "not measured" with the reason (never 0). */
function Stability({
  b,
  value,
  why,
}: {
  b: ComparedBuild;
  value: (s: ComparedBuild["stability"]) => React.ReactNode | null;
  why: (s: ComparedBuild["stability"]) => string | null;
}) {
  if (!b.latestRun) return DASH;
  const s = b.stability;
  const shown = s.measured ? value(s) : null;
  if (shown !== null) return shown;
  return (
    <span>
      not measured
      <span className="ml-auto block max-w-[14rem] text-[11px] text-ink-faint">{s.measured ? why(s) : s.reason}</span>
    </span>
  );
}
