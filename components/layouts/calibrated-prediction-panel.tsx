import Link from "next/link";
import { buttonVariants } from "@/components/ui/button";
import { Select } from "@/components/ui/field";
import { formatPercent, formatQuantity, formatRange } from "@/lib/format/numbers";
import { MIN_BUILDS_FOR_TRUST } from "@/lib/layouts/layout-figures";
import type { PredictionFigures } from "@/lib/layouts/calibrated-prediction";
import type { CalibratedView } from "@/lib/logbook/layouts";
import { picofaradFigure, picofaradSpread } from "./figure-format";

export interface CalibratedPredictionPanelProps {
  view: CalibratedView;
  /**
   * Where the construction chooser submits (a GET form with `construction`); without it the construction is fixed,
   * as on a build page, where the build is its own construction.
   */
  chooserPath?: string;
  /** Query values the chooser keeps. */
  keep?: Record<string, string>;
}

/** One prediction with its worst-case and statistical bands; with `reference`, its shift from that one. */
export function PredictionColumn({ title, figures, reference }: { title: string; figures: PredictionFigures; reference?: PredictionFigures }) {
  const f = figures.predictedHz;
  const shift = reference ? formatPercent(((f - reference.predictedHz) / reference.predictedHz) * 100, 2, { signed: true }) : null;
  return (
    <div className="min-w-0 rounded-md border border-rule bg-paper px-3 py-2.5">
      <h3 className="text-xs font-medium text-ink-soft">{title}</h3>
      <p className="num font-mono text-xl font-semibold leading-tight text-ink">{formatQuantity(f, "Hz", 6)}</p>
      {shift ? <p className="num font-mono text-xs text-ink-soft">{shift} from as designed</p> : <p className="text-xs text-ink-faint">nominal values</p>}
      <dl className="mt-2 space-y-1 text-xs">
        <div>
          <dt className="text-ink-soft">Worst case</dt>
          <dd className="num font-mono text-[13px] text-ink">{formatRange(figures.worstCase.minHz, figures.worstCase.maxHz, "Hz", 5)}</dd>
        </div>
        <div>
          <dt className="text-ink-soft">Statistical (99.7 %)</dt>
          <dd className="num font-mono text-[13px] text-ink">{formatRange(figures.statistical.minHz, figures.statistical.maxHz, "Hz", 5)}</dd>
        </div>
        <div>
          <dt className="text-ink-soft">Effective C</dt>
          <dd className="num font-mono text-[13px] text-ink">{formatQuantity(figures.cEffF, "F", 4)}</dd>
        </div>
      </dl>
    </div>
  );
}

/** The prediction as designed beside the prediction as it will likely measure on one of this lab's constructions. */
export function CalibratedPredictionPanel({ view, chooserPath, keep = {} }: CalibratedPredictionPanelProps) {
  const figure = view.figure;
  const p = view.prediction;
  const place = view.constructionName.toLowerCase().startsWith("pcb") ? view.constructionName : `a ${view.constructionName.toLowerCase()}`;
  return (
    <div className="space-y-3">
      {chooserPath ? (
        <form action={chooserPath} method="get" className="flex flex-wrap items-end gap-2" aria-label="Construction for the calibrated prediction">
          {Object.entries(keep).map(([k, v]) => (
            <input key={k} type="hidden" name={k} value={v} />
          ))}
          <div className="min-w-0 flex-1">
            <label htmlFor="calibration-construction" className="mb-1 block text-xs font-medium text-ink-soft">
              Built as
            </label>
            <Select id="calibration-construction" name="construction" defaultValue={view.constructionKey}>
              {view.choices.map((c) => (
                <option key={c.key} value={c.key}>
                  {c.name}
                  {c.buildCount > 0 ? ` (${c.buildCount} steady ${c.buildCount === 1 ? "build" : "builds"})` : " (no figure yet)"}
                </option>
              ))}
            </Select>
          </div>
          <button type="submit" className={buttonVariants({ variant: "secondary", size: "md" })}>
            Predict
          </button>
        </form>
      ) : null}
      {p ? (
        <>
          <div className="grid gap-2 sm:grid-cols-2">
            <PredictionColumn title="As designed" figures={p.asDesigned} />
            <PredictionColumn title={`As it will likely measure on ${place} here`} figures={p.asBuilt} reference={p.asDesigned} />
          </div>
          <p className="text-xs text-ink-soft">
            {view.constructionName} adds <span className="num font-mono text-ink">{picofaradFigure(p.labCapacitanceF)}</span>
            {p.labSpreadF > 0 ? (
              <>
                {" "}
                ± <span className="num font-mono text-ink">{picofaradSpread(p.labSpreadF)}</span> between builds
              </>
            ) : null}{" "}
            in this lab (median of {figure!.capacitanceF.count} steady {figure!.capacitanceF.count === 1 ? "build" : "builds"}), taken in parallel with
            the tank; the bands widen by that spread.{" "}
            <Link className="text-copper underline" href={`/layouts?${new URLSearchParams({ kind: view.construction.kind, topology: figure!.topology })}`}>
              The builds behind it
            </Link>
          </p>
          {figure!.strength === "thin" ? (
            <p className="rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-3 py-2 text-xs text-ink">
              <span aria-hidden="true">◔ </span>
              Thin figure: {figure!.capacitanceF.count} steady {figure!.capacitanceF.count === 1 ? "build" : "builds"}, fewer than the {MIN_BUILDS_FOR_TRUST} a
              trusted figure needs.
            </p>
          ) : null}
        </>
      ) : (
        <p className="text-sm text-ink-soft">{view.error}</p>
      )}
    </div>
  );
}
