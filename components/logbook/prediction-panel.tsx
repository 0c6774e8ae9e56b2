import type { DesignReport } from "@/lib/oscillator/report";
import { DASH, formatPercent, formatQuantity, formatRange } from "@/lib/format/numbers";

function relative(valueHz: number, nominalHz: number): string {
  return formatPercent(((valueHz - nominalHz) / nominalHz) * 100, 2, { signed: true });
}

function Row({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <div className="contents">
      <dt className="text-ink-soft">{label}</dt>
      <dd className="num text-right font-mono text-[13px] text-ink">
        {value}
        {detail ? <span className="block text-[11px] text-ink-faint">{detail}</span> : null}
      </dd>
    </div>
  );
}

/**
 * The prediction of a design: f0, effective C and L, feedback fraction, start-up gain, the worst-case and
 * statistical bands, and what the model assumes. Pure display; the report comes from lib/oscillator.
 */
export function PredictionPanel({ report }: { report: DesignReport }) {
  const f0 = report.predictedHz;
  const stat = report.statistical;
  return (
    <div className="space-y-3">
      <div>
        <p className="text-xs font-medium text-ink-soft">Predicted f0</p>
        <p className="num font-mono text-2xl font-semibold leading-tight text-ink">{formatQuantity(f0, "Hz", 6)}</p>
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-sm">
        <Row label="Effective C" value={formatQuantity(report.cEffF, "F", 4)} detail={report.extraCapacitanceF ? `incl. ${formatQuantity(report.extraCapacitanceF, "F", 3, { trimZeros: true })} extra` : undefined} />
        <Row label="Effective L" value={formatQuantity(report.lEffH, "H", 4)} detail={report.mutualInductanceH ? `incl. M = ${formatQuantity(report.mutualInductanceH, "H", 3)}` : undefined} />
        <Row label="Feedback fraction β" value={report.feedbackFraction === null ? "none (bare tank)" : report.feedbackFraction.toPrecision(4)} />
        <Row label="Minimum gain to start" value={report.minGain === null ? DASH : `${report.minGain.toPrecision(4)} ×`} />
        <Row
          label="Worst case"
          value={formatRange(report.worstCase.minHz, report.worstCase.maxHz, "Hz", 5)}
          detail={`${relative(report.worstCase.minHz, f0)} / ${relative(report.worstCase.maxHz, f0)} over ${report.worstCase.corners} tolerance corners`}
        />
        <Row
          label="Statistical"
          value={formatRange(stat.minHz, stat.maxHz, "Hz", 5)}
          detail={`${(stat.coverage * 100).toFixed(1)} % of ${stat.trials.toLocaleString("en-GB")} simulated builds · σ ${formatQuantity(stat.stdDevHz, "Hz", 3)}`}
        />
      </dl>
      {report.bandWarning ? (
        <p className="rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-3 py-2 text-xs text-ink" role="note">
          <strong className="font-semibold">Some tolerance corners are no tank.</strong> {report.bandWarning}.
        </p>
      ) : null}
      <details className="rounded-md bg-paper-sunk/60 px-3 py-2 text-xs leading-relaxed text-ink-soft">
        <summary className="cursor-pointer font-medium text-ink">What the model assumes</summary>
        <p className="mt-1">{report.assumptions}</p>
      </details>
    </div>
  );
}
