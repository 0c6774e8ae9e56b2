"use client";

import Link from "next/link";
import { useActionState, useDeferredValue, useEffect, useMemo, useRef, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field, FormMessage, Input, Select, Textarea, describedBy } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { TOPOLOGIES, TOPOLOGY_PARTS, type Topology } from "@/lib/oscillator/design";
import { formatQuantity } from "@/lib/format/numbers";
import { cn } from "@/lib/utils";
import { TOPOLOGY_NAMES } from "./design-model";
import { DesignErrorSummary, designFieldId, designFieldLabel, type SummaryItem } from "./design-error-summary";
import { previewDesign, switchTopology, type DesignDraft, type PartDraft, type SpecDraft } from "./design-draft";
import { PredictionPanel } from "./prediction-panel";
import { ValueProposalStep, type ValueProposalStepProps } from "./value-proposal-step";
import { SpecFields } from "./design-spec-fields";

export interface DesignFormProps {
  /** The server action that saves; not used in "whatif" mode. */
  action?: (state: FormState, formData: FormData) => Promise<FormState>;
  initialDraft: DesignDraft;
  /** Editing keeps the topology (a new topology is a new design); "whatif" only predicts and saves nothing. */
  mode: "create" | "edit" | "whatif";
  cancelHref?: string;
  /** The "start from a target" step (create mode): the server action and this lab's constructions per topology. */
  proposal?: Pick<ValueProposalStepProps, "propose" | "constructions">;
}

async function saveNothing(state: FormState): Promise<FormState> {
  return state;
}

const UNIT_WORD = { inductance: "H", capacitance: "F", coupling: "" } as const;

/**
 * Create or edit a design. The prediction beside the form is recomputed as values are typed, in the browser, with
 * the server's own schema and model; saving an edit makes a new revision.
 */
export function DesignForm({ action, initialDraft, mode, cancelHref, proposal }: DesignFormProps) {
  const whatIf = mode === "whatif";
  const [state, formAction, pending] = useActionState(action ?? saveNothing, {} as FormState);
  const [draft, setDraft] = useState<DesignDraft>(initialDraft);
  const deferred = useDeferredValue(draft);
  const preview = useMemo(() => previewDesign(deferred), [deferred]);
  const problems = preview.problems;
  const serverErrors = state.errors ?? {};
  // After a refused submit every problem shows, empty fields included, and the summary lists them all.
  const [submitted, setSubmitted] = useState(false);
  const [focusRequest, setFocusRequest] = useState(0);
  const summaryRef = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (focusRequest > 0) summaryRef.current?.focus();
  }, [focusRequest]);
  useEffect(() => {
    if (state.errors && Object.keys(state.errors).length > 0) setFocusRequest((n) => n + 1);
  }, [state]);

  /** Server errors always show; live problems once the field has something in it, or all of them after a submit. */
  function errorsFor(path: string, text: string): string[] | undefined {
    const server = serverErrors[path];
    if (server?.length) return server;
    if (text.trim() === "" && !submitted) return undefined;
    return problems[path];
  }

  const firstRef = Object.keys(TOPOLOGY_PARTS[draft.topology])[0];
  const summaryItems: SummaryItem[] = (() => {
    const byPath: Record<string, string[]> = { ...(submitted ? problems : {}) };
    if (submitted && !whatIf && draft.name.trim() === "") byPath.name = ["Give the design a name."];
    for (const [path, messages] of Object.entries(serverErrors)) byPath[path] = [...new Set([...(byPath[path] ?? []), ...messages])];
    return Object.entries(byPath).flatMap(([path, messages]) =>
      messages.map((message) => ({ fieldId: designFieldId(path, firstRef), label: designFieldLabel(path), message })),
    );
  })();

  /** Refuses the submit in the browser when the schema already finds problems, and moves focus to the summary. */
  function checkBeforeSubmit(event: FormEvent<HTMLFormElement>) {
    setSubmitted(true);
    const now = previewDesign(draft);
    if (Object.keys(now.problems).length > 0 || draft.name.trim() === "") {
      event.preventDefault();
      setFocusRequest((n) => n + 1);
    }
  }

  const setPart = (ref: string, patch: Partial<PartDraft>) =>
    setDraft((d) => ({ ...d, parts: { ...d.parts, [ref]: { ...d.parts[ref], ...patch } } }));
  const setSpec = (patch: Partial<SpecDraft>) => setDraft((d) => ({ ...d, spec: { ...d.spec, ...patch } }));
  const roles = TOPOLOGY_PARTS[draft.topology];
  const generalPartErrors = [...new Set([...(serverErrors.parts ?? []), ...(problems.parts ?? [])])];

  const summary = preview.report ? (
    <p className="num font-mono text-sm text-ink">
      f0 = <strong>{formatQuantity(preview.report.predictedHz, "Hz", 6)}</strong>
      <span className="text-ink-faint">
        {" "}
        ({formatQuantity(preview.report.worstCase.minHz, "Hz", 4)} – {formatQuantity(preview.report.worstCase.maxHz, "Hz", 4)} worst case)
      </span>
    </p>
  ) : (
    <p className="text-sm text-ink-faint">{preview.incomplete ? "Enter every required value to see the prediction." : "Fix the values marked to see the prediction."}</p>
  );

  return (
    <form
      action={whatIf ? undefined : formAction}
      onSubmit={whatIf ? (e) => e.preventDefault() : checkBeforeSubmit}
      noValidate
      aria-label={whatIf ? "Try other part values" : mode === "edit" ? "Edit the design" : "New design"}
      className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_22rem]"
    >
      <div className="min-w-0 space-y-5">
        <DesignErrorSummary ref={summaryRef} items={whatIf ? [] : summaryItems} />
        <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
        {whatIf ? (
          <p className="text-sm text-ink-soft">
            Change any value to see what the prediction would be. Nothing here is saved{" "}
            {cancelHref ? "— edit the design to keep a change." : "."}
          </p>
        ) : null}
        <Card className={whatIf ? "hidden" : undefined}>
          <CardHeader title="Design" />
          <CardBody className="grid gap-4 sm:grid-cols-2">
            <Field id="design-name" label="Name" errors={serverErrors.name ?? (submitted && draft.name.trim() === "" ? ["Give the design a name."] : undefined)}>
              <Input
                id="design-name"
                name="name"
                value={draft.name}
                maxLength={120}
                onChange={(e) => setDraft((d) => ({ ...d, name: e.target.value }))}
                aria-describedby={describedBy("design-name")}
                aria-invalid={serverErrors.name || (submitted && draft.name.trim() === "") ? true : undefined}
              />
            </Field>
            <Field id="design-topology" label="Topology" errors={serverErrors.topology} hint={mode === "edit" ? "A different topology is a new design." : undefined}>
              <Select
                id="design-topology"
                name="topology"
                value={draft.topology}
                disabled={mode === "edit"}
                onChange={(e) => setDraft((d) => switchTopology(d, e.target.value as Topology))}
                aria-describedby={describedBy("design-topology")}
              >
                {TOPOLOGIES.map((t) => (
                  <option key={t} value={t}>
                    {TOPOLOGY_NAMES[t]}
                  </option>
                ))}
              </Select>
              {mode === "edit" ? <input type="hidden" name="topology" value={draft.topology} /> : null}
            </Field>
          </CardBody>
        </Card>

        {proposal && mode === "create" ? (
          <ValueProposalStep
            key={draft.topology}
            topology={draft.topology}
            targetText={draft.spec.targetHz}
            inductanceTexts={Object.fromEntries(Object.entries(draft.parts).map(([ref, p]) => [ref, p.value]))}
            constructions={proposal.constructions}
            propose={proposal.propose}
            onAccept={(values, targetText) =>
              setDraft((d) => ({
                ...d,
                // Only the values change: tolerances and tempcos already typed stay.
                parts: {
                  ...d.parts,
                  ...Object.fromEntries(Object.entries(values).map(([ref, v]) => [ref, { ...(d.parts[ref] ?? { value: "", tolerance: "", tempco: "" }), value: v }])),
                },
                spec: d.spec.targetHz.trim() === "" ? { ...d.spec, targetHz: targetText } : d.spec,
              }))
            }
          />
        ) : null}

        <Card>
          <CardHeader
            title="Parts"
            description="Values in engineering notation or IEC 60062 codes (4n7, 4.7 nF, 10u, 2u2). Tolerance as 5 %, ±1 % or a letter (J, K). Tempco optional: C0G, N750, ±30 ppm/°C."
          />
          <CardBody className="space-y-4">
            {generalPartErrors.length > 0 ? (
              <div aria-live="polite">
                {generalPartErrors.map((e) => (
                  <p key={e} className="text-xs font-medium text-verdict-fail">
                    {e}
                  </p>
                ))}
              </div>
            ) : null}
            {Object.entries(roles).map(([ref, role]) => {
              const part = draft.parts[ref] ?? { value: "", tolerance: "", tempco: "" };
              const base = `part-${ref}`;
              const unit = UNIT_WORD[role.kind];
              return (
                <fieldset key={ref} className="rounded-md border border-rule px-3 pb-3 pt-1">
                  <legend className="px-1 text-sm">
                    <span className="font-mono font-semibold text-ink">{ref}</span>{" "}
                    <span className="text-ink-soft">
                      {role.description}
                      {role.required ? "" : " (optional)"}
                    </span>
                  </legend>
                  <div className="grid grid-cols-[1.3fr_1fr_1fr] gap-2 sm:gap-3">
                    <Field id={`${base}-value`} label={unit ? `Value (${unit})` : "Value"} errors={errorsFor(`parts.${ref}.value`, part.value)}>
                      <Input
                        id={`${base}-value`}
                        name={`parts.${ref}.value`}
                        value={part.value}
                        autoComplete="off"
                        spellCheck={false}
                        placeholder={role.kind === "inductance" ? "e.g. 10u" : role.kind === "capacitance" ? "e.g. 4n7" : "0 to 1"}
                        onChange={(e) => setPart(ref, { value: e.target.value })}
                        aria-describedby={describedBy(`${base}-value`)}
                        aria-invalid={errorsFor(`parts.${ref}.value`, part.value) ? true : undefined}
                        className="num font-mono"
                      />
                    </Field>
                    {role.kind === "coupling" ? null : (
                      <>
                        <Field id={`${base}-tol`} label="Tolerance" errors={errorsFor(`parts.${ref}.tolerance`, part.tolerance)}>
                          <Input
                            id={`${base}-tol`}
                            name={`parts.${ref}.tolerance`}
                            value={part.tolerance}
                            autoComplete="off"
                            placeholder="e.g. 5%"
                            onChange={(e) => setPart(ref, { tolerance: e.target.value })}
                            aria-describedby={describedBy(`${base}-tol`)}
                            aria-invalid={errorsFor(`parts.${ref}.tolerance`, part.tolerance) ? true : undefined}
                            className="num font-mono"
                          />
                        </Field>
                        <Field id={`${base}-tempco`} label="Tempco" errors={errorsFor(`parts.${ref}.tempco`, part.tempco)}>
                          <Input
                            id={`${base}-tempco`}
                            name={`parts.${ref}.tempco`}
                            value={part.tempco}
                            autoComplete="off"
                            placeholder="optional"
                            onChange={(e) => setPart(ref, { tempco: e.target.value })}
                            aria-describedby={describedBy(`${base}-tempco`)}
                            aria-invalid={errorsFor(`parts.${ref}.tempco`, part.tempco) ? true : undefined}
                            className="num font-mono"
                          />
                        </Field>
                      </>
                    )}
                  </div>
                </fieldset>
              );
            })}
            <div className="grid gap-3 sm:grid-cols-2">
              <Field
                id="design-extra"
                label="Known extra capacitance (F)"
                hint="Optional: probe input, trimmer or known stray, taken in parallel with the effective C."
                errors={errorsFor("extraCapacitance", draft.extraCapacitance)}
              >
                <Input
                  id="design-extra"
                  name="extraCapacitance"
                  value={draft.extraCapacitance}
                  autoComplete="off"
                  placeholder="e.g. 12p"
                  onChange={(e) => setDraft((d) => ({ ...d, extraCapacitance: e.target.value }))}
                  aria-describedby={describedBy("design-extra")}
                  aria-invalid={errorsFor("extraCapacitance", draft.extraCapacitance) ? true : undefined}
                  className="num font-mono"
                />
              </Field>
              {draft.topology === "hartley" ? (
                <Field id="design-windings" label="Windings" hint="Aiding for the usual tapped coil." errors={serverErrors.windings}>
                  <Select
                    id="design-windings"
                    name="windings"
                    value={draft.windings}
                    onChange={(e) => setDraft((d) => ({ ...d, windings: e.target.value as DesignDraft["windings"] }))}
                    aria-describedby={describedBy("design-windings")}
                  >
                    <option value="">Aiding (default)</option>
                    <option value="aiding">Aiding</option>
                    <option value="opposing">Opposing</option>
                  </Select>
                </Field>
              ) : null}
            </div>
            <div aria-live="polite" className="rounded-md border border-dashed border-rule-strong bg-paper px-3 py-2 lg:hidden">
              {summary}
            </div>
          </CardBody>
        </Card>

        {whatIf ? null : <SpecFields spec={draft.spec} setSpec={setSpec} errorsFor={errorsFor} />}

        {whatIf ? null : mode === "edit" ? (
          <Card>
            <CardBody>
              <Field id="design-note" label="What changed, and why" hint="Kept with the revision in the history." errors={serverErrors.changeNote}>
                <Textarea
                  id="design-note"
                  name="changeNote"
                  rows={2}
                  value={draft.changeNote}
                  maxLength={500}
                  onChange={(e) => setDraft((d) => ({ ...d, changeNote: e.target.value }))}
                  aria-describedby={describedBy("design-note")}
                />
              </Field>
            </CardBody>
          </Card>
        ) : (
          <input type="hidden" name="changeNote" value={draft.changeNote} />
        )}

        <div className={cn("flex flex-wrap items-center gap-3", whatIf && "hidden")}>
          <Button type="submit" disabled={pending}>
            {pending ? "Saving…" : mode === "edit" ? "Save as a new revision" : "Create design"}
          </Button>
          <Link href={cancelHref ?? "/projects"} className="text-sm font-medium text-ink-soft underline underline-offset-2 hover:text-ink">
            Cancel
          </Link>
        </div>
      </div>

      <aside aria-label="Live prediction" className="min-w-0">
        <Card className="lg:sticky lg:top-4">
          <CardHeader title="Prediction" description="Updates as you type." />
          <CardBody aria-live="polite">
            {preview.report ? <PredictionPanel report={preview.report} /> : summary}
          </CardBody>
        </Card>
      </aside>
    </form>
  );
}
