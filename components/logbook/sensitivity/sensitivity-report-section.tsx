import { SensitivityScatterChart } from "@/components/charts/sensitivity-scatter-chart";
import type { SensitivityReport } from "@/lib/sensitivity/types";
import { RunToRunTable } from "./run-to-run-table";
import { scatterSeries } from "./scatter-data";
import { absoluteSlopeText, ppmSlopeText, sigmaBasisText, tempcoSentence, valueWithSigma } from "./sensitivity-text";
import { sensitivityMethodText } from "./sensitivity-card";

/** The printed report's sensitivity section: pushing, tempco against the parts, run-to-run stability, in words and a table. */
export function SensitivityReportSection({ report }: { report: SensitivityReport }) {
  const current = report.currentGroupIndex !== null ? report.groups[report.currentGroupIndex] : null;
  if (!current) return <p className="text-sm text-ink-soft">No analysed run to characterise yet.</p>;
  const rows: [string, string, string][] = [
    [
      "Pushing",
      current.pushing.measured ? `${ppmSlopeText(current.pushing, "ppm/V")} (${absoluteSlopeText(current.pushing, "Hz/V")})` : "not measured",
      current.pushing.measured ? (sigmaBasisText(current.pushing) ?? "") : current.pushing.reason,
    ],
    [
      "Amplitude against supply",
      current.amplitudePushing.measured ? valueWithSigma(current.amplitudePushing.slope * 1000, current.amplitudePushing.slopeSigma * 1000, "mV/V") : "not measured",
      current.amplitudePushing.measured ? (sigmaBasisText(current.amplitudePushing) ?? "") : current.amplitudePushing.reason,
    ],
    ["Temperature coefficient", ppmSlopeText(current.tempco, "ppm/K") ?? "not measured", tempcoSentence(current.tempco, current.predictedTempco)],
  ];
  const charts = [scatterSeries(current, "supply"), scatterSeries(current, "temperature")].filter((c) => c !== null);
  return (
    <div className="space-y-3">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Pushing and temperature coefficient of the build as it stands</caption>
        <tbody>
          {rows.map(([name, value, note]) => (
            <tr key={name} className="border-b border-rule/60 align-top">
              <th scope="row" className="py-1.5 pr-3 font-medium text-ink">
                {name}
              </th>
              <td className="num whitespace-nowrap py-1.5 pr-3 font-mono text-[13px]">{value}</td>
              <td className="py-1.5 text-xs text-ink-soft">{note}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {charts.map((series) => (
        <div key={series.variable} className="print:break-inside-avoid print:[&_figcaption>p:last-child]:hidden print:[&_figure>div:first-child]:hidden">
          <SensitivityScatterChart series={series} height={200} />
        </div>
      ))}
      {report.repeatSets.length > 0 ? (
        <div className="print:break-inside-avoid">
          <h3 className="mb-1 text-sm font-semibold text-ink">Run-to-run stability</h3>
          <RunToRunTable sets={report.repeatSets} testLevel={report.settings.testLevel} showState={report.groups.length > 1} />
        </div>
      ) : (
        <p className="text-xs text-ink-soft">Run-to-run stability: no condition repeated without a tweak in between.</p>
      )}
      {report.excluded.length > 0 ? (
        <p className="text-xs text-ink-soft">
          Left out: {report.excluded.map((e) => `${e.originalFilename} (${e.reason})`).join("; ")}.
        </p>
      ) : null}
      <p className="text-xs text-ink-faint">{sensitivityMethodText(report)}</p>
    </div>
  );
}
