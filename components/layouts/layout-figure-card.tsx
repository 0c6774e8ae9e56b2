import Link from "next/link";
import { TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { MIN_BUILDS_FOR_TRUST, type LayoutFigure } from "@/lib/layouts/layout-figures";
import { FigureStrengthBadge } from "./figure-strength-badge";
import { inductanceErrorText, picofaradFigure, picofaradSpread } from "./figure-format";

export interface LayoutFigureCardProps {
  figure: LayoutFigure;
  /** Builds listed at most; the rest are behind `moreHref`. Default: all. */
  buildLimit?: number;
  /** Where the full list of this figure's builds is. */
  moreHref?: string;
}

const link = "underline-offset-2 hover:text-copper hover:underline";

/** One construction × topology: what it adds, how much builds disagree, and every build the figure rests on. */
export function LayoutFigureCard({ figure, buildLimit, moreHref }: LayoutFigureCardProps) {
  const c = figure.capacitanceF;
  const l = figure.inductanceErrorFraction;
  const headingId = `figure-${figure.constructionKey.replace(/[^a-z0-9]+/g, "-")}-${figure.topology}`;
  const leftOut = figure.candidateBuildCount - c.count;
  const shown = buildLimit === undefined ? figure.builds : figure.builds.slice(0, buildLimit);
  return (
    <Card aria-labelledby={headingId}>
      <CardHeader
        title={
          <span id={headingId}>
            {figure.constructionName} · {TOPOLOGY_NAMES[figure.topology]}
          </span>
        }
        description={<FigureStrengthBadge strength={figure.strength} count={c.count} />}
      />
      <CardBody className="space-y-3">
        {c.count === 0 ? (
          <p className="text-sm text-ink-soft">
            {figure.candidateBuildCount} {figure.candidateBuildCount === 1 ? "build has" : "builds have"} trusted runs here, but none holds its implied
            capacitance across a tweak yet. Log a capture after the next tweak on each build.
          </p>
        ) : (
          <>
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
              <div>
                <dt className="text-xs text-ink-soft">Adds (median)</dt>
                <dd className="font-mono text-lg font-semibold text-ink">{picofaradFigure(c.median)}</dd>
              </div>
              <div>
                <dt className="text-xs text-ink-soft">Spread between builds (scaled MAD)</dt>
                <dd className="font-mono text-lg text-ink">{c.scaledMad === null ? "—" : `± ${picofaradSpread(c.scaledMad)}`}</dd>
              </div>
              <div>
                <dt className="text-xs text-ink-soft">Builds observed from … to</dt>
                <dd className="font-mono text-sm text-ink">
                  {picofaradFigure(c.min)} … {picofaradFigure(c.max)}
                </dd>
              </div>
              <div>
                <dt className="text-xs text-ink-soft">Rests on</dt>
                <dd className="font-mono text-sm text-ink">
                  {c.count} steady {c.count === 1 ? "build" : "builds"}
                  {leftOut > 0 ? <span className="block font-sans text-xs text-ink-soft">{leftOut} more not steady yet</span> : null}
                </dd>
              </div>
            </dl>
            {figure.strength === "thin" ? (
              <p className="rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-3 py-2 text-sm text-ink">
                <span aria-hidden="true">◔ </span>
                Too few builds to trust: this figure rests on {c.count} steady {c.count === 1 ? "build" : "builds"}, and Tankbook trusts a figure
                from {MIN_BUILDS_FOR_TRUST}. Use it as a first guess{c.count < 2 ? "; one build says nothing about the spread" : ""}.
              </p>
            ) : null}
            {l.count > 0 ? (
              <p className="text-sm text-ink-soft">
                {l.count} of these {l.count === 1 ? "build runs" : "builds run"} above {l.count === 1 ? "its" : "their"} prediction, which no stray
                capacitance causes: read as an inductance error instead, L_eff is off by{" "}
                <span className="font-mono text-ink">{inductanceErrorText(l.median)}</span>
                {l.scaledMad !== null ? (
                  <>
                    {" "}
                    (± <span className="font-mono">{inductanceErrorText(l.scaledMad).replace(/^\+/, "")}</span> between builds)
                  </>
                ) : null}
                .
              </p>
            ) : null}
            <Table caption={`Steady builds behind the ${figure.constructionName} figure for ${TOPOLOGY_NAMES[figure.topology]}`}>
              <thead>
                <tr>
                  <Th>Build</Th>
                  <Th>Design</Th>
                  <Th className="text-right">Implied</Th>
                  <Th className="text-right">Spread across tweaks</Th>
                  <Th className="text-right">Runs</Th>
                  <Th className="text-right">L error</Th>
                </tr>
              </thead>
              <tbody>
                {shown.map((b) => (
                  <Tr key={b.buildId}>
                    <Td className="whitespace-nowrap">
                      <Link className={`font-medium text-ink ${link}`} href={`/builds/${b.buildId}`}>
                        {b.label}
                      </Link>
                    </Td>
                    <Td>
                      <Link className={`text-ink-soft ${link}`} href={`/projects/${b.projectId}/designs/${b.designId}`}>
                        {b.designName}
                      </Link>
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      <Link className={link} href={`/builds/${b.buildId}`}>
                        {picofaradFigure(b.typicalF)}
                      </Link>
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      <Link className={link} href={`/builds/${b.buildId}`}>
                        {picofaradSpread(b.spreadF)}
                      </Link>
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      <Link className={link} href={`/builds/${b.buildId}`} aria-label={`${b.runCount} trusted runs over ${b.segmentCount} stretches between tweaks`}>
                        {b.runCount} / {b.segmentCount - 1}T
                      </Link>
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      <Link className={link} href={`/builds/${b.buildId}`}>
                        {b.typicalF < 0 ? inductanceErrorText(b.inductanceErrorFraction) : "—"}
                      </Link>
                    </Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
            {shown.length < figure.builds.length && moreHref ? (
              <p className="text-sm">
                <Link className="text-copper underline" href={moreHref}>
                  Show all {figure.builds.length} builds behind this figure
                </Link>
              </p>
            ) : null}
            <p className="text-xs text-ink-soft">
              Runs / T: trusted runs and the tweaks between them. Each number opens its build.
              {figure.builds.length >= 2 ? (
                <>
                  {" "}
                  <Link className="text-copper underline" href={`/builds/compare?ids=${figure.builds.slice(0, MAX_COMPARED_BUILDS).map((b) => b.buildId).join(",")}`}>
                    Compare these builds
                  </Link>
                </>
              ) : null}
            </p>
          </>
        )}
      </CardBody>
    </Card>
  );
}
