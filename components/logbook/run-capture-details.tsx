import Link from "next/link";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { formatSampleRate } from "@/lib/analysis/format-rate";
import { formatBytes } from "@/lib/format/bytes";
import { formatDateTime } from "@/lib/format/dates";
import { DASH, formatPartValue, formatPercent, formatPpm, formatQuantity } from "@/lib/format/numbers";
import { partUnitOrBlank } from "./part-unit";
import type { RunFigures } from "./run-results";
import type { RunContext, RunData } from "./run-types";

/** The capture file, the record's own figures, the as-built snapshot and the preamble. */
export function CaptureDetails({ run, figures, context }: { run: RunData; figures: RunFigures; context: RunContext }) {
  const durationS = figures.samples !== null && figures.sampleRateHz ? figures.samples / figures.sampleRateHz : null;
  const rows: Array<[string, string]> = [
    ["File", run.originalFilename],
    ["Size", formatBytes(run.sizeBytes)],
    ["SHA-256", run.sha256],
    ["Channel", run.channel ?? "first voltage column"],
    ["Probe attenuation", `×${run.probeAttenuation}`],
    ["Supply", run.supplyV === null ? DASH : formatQuantity(run.supplyV, "V", 3, { trimZeros: true })],
    ["Temperature", run.temperatureC === null ? DASH : `${run.temperatureC} °C`],
  ];
  // Figures of the record itself exist only once it has been read.
  if (run.status === "done") {
    rows.push(
      ["Sample rate", figures.sampleRateHz === null ? DASH : formatSampleRate(figures.sampleRateHz)],
      ["Samples", figures.samples === null ? DASH : figures.samples.toLocaleString("en-GB")],
      ["Record length", durationS === null ? DASH : formatQuantity(durationS, "s", 4)],
      ["In-record drift", formatPpm(run.inRecordDriftPpm ?? figures.inRecordDriftPpm)],
    );
  }
  rows.push(["Uploaded", `${formatDateTime(run.createdAt)} by ${run.createdByName}`]);
  if (run.finishedAt) rows.push([run.status === "failed" ? "Tried" : "Analysed", formatDateTime(run.finishedAt, { seconds: true })]);
  if (run.engineVersion) rows.push(["Engine version", run.engineVersion]);
  if (typeof run.attempts === "number" && run.attempts > 1) rows.push(["Analysis attempts", String(run.attempts)]);
  const parts = Object.entries(run.snapshot.parts);
  const preamble = Object.entries(figures.metadata);
  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <Card>
        <CardHeader title="Capture" />
        <CardBody>
          {run.note ? <p className="mb-3 whitespace-pre-wrap text-sm text-ink">{run.note}</p> : null}
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {rows.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-soft">{k}</dt>
                <dd className={`num min-w-0 text-right font-mono text-[13px] text-ink ${k === "SHA-256" || k === "File" ? "break-all" : "break-words"}`}>{v}</dd>
              </div>
            ))}
          </dl>
        </CardBody>
      </Card>
      <div className="space-y-5">
        <Card>
          <CardHeader
            title="As built at capture"
            description={
              <>
                Snapshot of <Link className="underline underline-offset-2" href={`/builds/${context.buildId}`}>{context.buildLabel}</Link>,
                design revision {run.snapshot.designRevision} ({run.snapshot.topology}).
              </>
            }
          />
          <CardBody>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              {parts.map(([ref, part]) => (
                <div key={ref} className="contents">
                  <dt className="font-mono text-ink-soft">{ref}</dt>
                  <dd className="num text-right font-mono text-[13px] text-ink">
                    {formatPartValue(part.valueSi, partUnitOrBlank(run.snapshot.topology, ref))}
                    {part.tolerance ? <span className="text-ink-faint"> ± {formatPercent(part.tolerance * 100, 2)}</span> : null}
                  </dd>
                </div>
              ))}
              {run.snapshot.extraCapacitanceF ? (
                <div className="contents">
                  <dt className="text-ink-soft">Extra C</dt>
                  <dd className="num text-right font-mono text-[13px] text-ink">{formatPartValue(run.snapshot.extraCapacitanceF, "F")}</dd>
                </div>
              ) : null}
            </dl>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Preamble" description="Lines the scope wrote before the header row, as found in the file." />
          <CardBody>
            {preamble.length === 0 ? (
              <p className="text-sm text-ink-soft">{run.status === "done" ? "The file has no preamble." : "Shown once the capture is analysed."}</p>
            ) : (
              <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                {preamble.map(([k, v]) => (
                  <div key={k} className="contents">
                    <dt className="break-all text-ink-soft">{k}</dt>
                    <dd className="break-all text-right font-mono text-[13px] text-ink">{v}</dd>
                  </div>
                ))}
              </dl>
            )}
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
