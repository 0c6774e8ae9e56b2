"use client";

import { useId, useState, useTransition } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { describedBy, Field, FormMessage, Input, Select } from "@/components/ui/field";
import { formatPpm, formatQuantity, formatSignedPicofarads } from "@/lib/format/numbers";
import type { ConstructionChoice, DesignValueProposals } from "@/lib/logbook/layouts";
import type { Topology } from "@/lib/oscillator/design";
import type { ValueProposalRequest } from "@/lib/validations/layouts";

/** What the step's server action answers (app/(app)/layouts/actions.ts). */
export type ProposeValuesAnswer = { ok: true; result: DesignValueProposals } | { ok: false; message: string; errors?: Record<string, string[]> };

export interface ValueProposalStepProps {
  topology: Topology;
  /** The spec's target as typed in the form, to start from. */
  targetText: string;
  /** Inductances already typed into the form (value text by ref); kept as given. */
  inductanceTexts: Record<string, string>;
  /** Constructions of this lab per topology, with their steady-build counts. */
  constructions: Record<Topology, ConstructionChoice[]>;
  /** proposeDesignValuesAction. */
  propose: (input: ValueProposalRequest) => Promise<ProposeValuesAnswer>;
  /** Puts the chosen values into the form's part fields (and the target into the spec when it was empty). */
  onAccept: (values: Record<string, string>, targetText: string) => void;
}

const INDUCTANCE_REFS: Record<Topology, string[]> = { tank: ["L"], colpitts: ["L"], clapp: ["L"], hartley: ["L1", "L2", "M", "k"] };

/**
 * "Start from a target": a frequency, the construction it will be built on and a series, and the step proposes
 * standard values that land there as built here (the lab's figure for that construction included). Accepting
 * copies them into the part fields, where they can still be edited.
 */
export function ValueProposalStep({ topology, targetText, inductanceTexts, constructions, propose, onAccept }: ValueProposalStepProps) {
  const uid = useId();
  const [target, setTarget] = useState(targetText);
  const choices = constructions[topology] ?? [];
  const [construction, setConstruction] = useState(choices[0]?.key ?? "breadboard");
  const [series, setSeries] = useState<"E12" | "E24">("E12");
  const [ratio, setRatio] = useState("");
  const [answer, setAnswer] = useState<ProposeValuesAnswer | null>(null);
  const [accepted, setAccepted] = useState<number | null>(null);
  const [pending, startTransition] = useTransition();
  const fixed = Object.fromEntries(INDUCTANCE_REFS[topology].map((ref) => [ref, inductanceTexts[ref]?.trim() ?? ""]).filter(([, v]) => v !== ""));
  const errors = answer && !answer.ok ? (answer.errors ?? {}) : {};
  const hasDivider = topology === "colpitts" || topology === "clapp";

  function run() {
    setAccepted(null);
    startTransition(async () => {
      setAnswer(await propose({ topology, targetHz: target, construction, series, dividerRatio: ratio || undefined, fixed }));
    });
  }

  function accept(result: DesignValueProposals, index: number) {
    setAccepted(index);
    onAccept(result.proposals[index].values, target);
  }

  const ids = { target: `${uid}-target`, construction: `${uid}-construction`, series: `${uid}-series`, ratio: `${uid}-ratio` };
  return (
    <Card aria-labelledby={`${uid}-title`}>
      <CardHeader
        title={<span id={`${uid}-title`}>Start from a target</span>}
        description="Propose standard values that land on the target as built here: the lab's figure for the construction is taken in parallel with the tank."
      />
      <CardBody className="space-y-3">
        <div className="grid gap-3 sm:grid-cols-2">
          <Field id={ids.target} label="Target frequency" hint="e.g. 1.04M or 455k" errors={errors.targetHz}>
            <Input
              id={ids.target}
              value={target}
              onChange={(e) => setTarget(e.target.value)}
              autoComplete="off"
              className="num font-mono"
              aria-describedby={describedBy(ids.target)}
              aria-invalid={errors.targetHz ? true : undefined}
            />
          </Field>
          <Field id={ids.construction} label="Built as" errors={errors.construction}>
            <Select id={ids.construction} value={construction} onChange={(e) => setConstruction(e.target.value)} aria-describedby={describedBy(ids.construction)}>
              {choices.map((c) => (
                <option key={c.key} value={c.key}>
                  {c.name}
                  {c.buildCount > 0 ? ` (${c.buildCount} steady ${c.buildCount === 1 ? "build" : "builds"})` : " (no figure yet)"}
                </option>
              ))}
            </Select>
          </Field>
          <Field id={ids.series} label="Series" errors={errors.series}>
            <Select id={ids.series} value={series} onChange={(e) => setSeries(e.target.value as "E12" | "E24")} aria-describedby={describedBy(ids.series)}>
              <option value="E12">E12</option>
              <option value="E24">E24</option>
            </Select>
          </Field>
          {hasDivider ? (
            <Field id={ids.ratio} label="Divider ratio C2/C1" hint="Optional; 1 by default (C1 = C2). The start-up gain needs at least C2/C1." errors={errors.dividerRatio}>
              <Input
                id={ids.ratio}
                value={ratio}
                onChange={(e) => setRatio(e.target.value)}
                inputMode="decimal"
                placeholder="1"
                className="num font-mono"
                aria-describedby={describedBy(ids.ratio)}
                aria-invalid={errors.dividerRatio ? true : undefined}
              />
            </Field>
          ) : null}
        </div>
        <p className="text-xs text-ink-soft">
          {Object.keys(fixed).length > 0
            ? `Keeps the ${Object.keys(fixed).join(", ")} typed in the parts below and proposes the capacitors.`
            : topology === "hartley"
              ? "Enter the coil's L1 and L2 (and M or k) in the parts below first: the step proposes the capacitor."
              : "Leave L empty to get a choice of inductors, or type the one you have and the step proposes the capacitors."}
        </p>
        <Button variant="secondary" size="sm" onClick={run} disabled={pending}>
          {pending ? "Proposing…" : "Propose values"}
        </Button>
        {answer && !answer.ok ? <FormMessage message={[answer.message, ...Object.values(errors).flat()].filter((v, i, a) => a.indexOf(v) === i).join(" ")} /> : null}
        {answer?.ok ? <Proposals result={answer.result} accepted={accepted} onAccept={(i) => accept(answer.result, i)} /> : null}
      </CardBody>
    </Card>
  );
}

function Proposals({ result, accepted, onAccept }: { result: DesignValueProposals; accepted: number | null; onAccept: (index: number) => void }) {
  if (result.proposals.length === 0) {
    return <p className="text-sm text-ink-soft">No standard values fit: with {result.constructionName.toLowerCase()}&apos;s figure the inductor leaves no room for a capacitor. Try a smaller inductor or a lower target.</p>;
  }
  return (
    <div className="space-y-2" aria-live="polite">
      <p className="text-xs text-ink-soft">
        {result.labCapacitanceF !== 0 ? (
          <>
            Includes {formatSignedPicofarads(result.labCapacitanceF)} that {result.constructionName.toLowerCase()} adds here ({result.figureBuildCount} steady{" "}
            {result.figureBuildCount === 1 ? "build" : "builds"}
            {result.figureStrength === "thin" ? ", a thin figure" : ""}).
          </>
        ) : (
          <>No {result.constructionName.toLowerCase()} figure yet: the values aim the bare model at the target.</>
        )}
      </p>
      <ul className="space-y-2">
        {result.proposals.map((p, i) => (
          <li key={i} className="flex flex-wrap items-center justify-between gap-2 rounded-md border border-rule bg-paper px-3 py-2">
            <span className="min-w-0">
              <span className="num block font-mono text-sm text-ink">
                {Object.entries(p.values)
                  .map(([ref, v]) => `${ref} ${v}`)
                  .join(" · ")}
              </span>
              <span className="num block font-mono text-xs text-ink-soft">
                {formatQuantity(p.predictedHz, "Hz", 6)} as built here · {formatPpm(p.errorPpm)} from target · X_L {formatQuantity(p.reactanceOhm, "Ω", 3)}
              </span>
            </span>
            <Button size="sm" variant={accepted === i ? "primary" : "secondary"} onClick={() => onAccept(i)} aria-label={`Use ${Object.entries(p.values).map(([ref, v]) => `${ref} ${v}`).join(", ")}`}>
              {accepted === i ? "In the form ✓" : "Use these values"}
            </Button>
          </li>
        ))}
      </ul>
      {accepted !== null ? <p className="text-xs text-ink-soft" role="status">Copied into the parts below; edit any of them before saving.</p> : null}
    </div>
  );
}
