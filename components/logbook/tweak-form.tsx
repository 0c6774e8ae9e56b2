"use client";

import { useActionState, useEffect, useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, Textarea, describedBy } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import type { Parts } from "@/db/queries/designs";
import { TOPOLOGY_PARTS, type Topology, type WindingSense } from "@/lib/oscillator/design";
import { partUnitOrBlank } from "@/components/logbook/part-unit";
import { predictOscillator } from "@/lib/oscillator/topologies";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";
import { formatPartValue, formatPpm, formatQuantity } from "@/lib/format/numbers";

export interface TweakFormProps {
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  topology: Topology;
  /** The build's parts as they are now: the "from" of a part change. */
  asBuilt: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
}

/**
 * Log a tweak: a part's new value (the old one is the build's current value), or a free note such as "moved the
 * probe ground". Shows what the new value would do to the predicted frequency before it is saved.
 */
export function TweakForm({ action, topology, asBuilt, extraCapacitanceF, windings }: TweakFormProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  const [partRef, setPartRef] = useState("");
  const [toValue, setToValue] = useState("");
  // After a logged tweak the form starts again (React resets the uncontrolled note itself).
  useEffect(() => {
    if (state.ok) {
      setPartRef("");
      setToValue("");
    }
  }, [state]);
  const roles = TOPOLOGY_PARTS[topology];
  const unit = partRef ? partUnitOrBlank(topology, partRef) : "";

  const effect = useMemo(() => {
    if (!partRef || toValue.trim() === "") return null;
    // The server's own schema, so the bench limits and decimal commas read the same here as when it is saved.
    const parsed = tweakInputSchemaFor(topology).safeParse({ partRef, toValue });
    if (!parsed.success) {
      const issue = parsed.error.issues.find((i) => i.path[0] === "toValue") ?? parsed.error.issues[0];
      return { error: issue?.message ?? "Not a value." };
    }
    const valueSi = parsed.data.toValue as number;
    try {
      const base = { topology, ...(extraCapacitanceF ? { extraCapacitanceF } : {}), ...(windings ? { windings } : {}) };
      const before = predictOscillator({ ...base, parts: asBuilt }).predictedHz;
      const after = predictOscillator({ ...base, parts: { ...asBuilt, [partRef]: { ...asBuilt[partRef], valueSi } } }).predictedHz;
      return { valueSi, before, after, ppm: ((after - before) / before) * 1e6 };
    } catch (err) {
      return { valueSi, error: err instanceof Error ? err.message : "The model refused this value." };
    }
  }, [partRef, toValue, topology, asBuilt, extraCapacitanceF, windings]);

  const current = partRef ? asBuilt[partRef] : undefined;
  return (
    <form action={formAction} noValidate className="space-y-3" aria-label="Log a tweak">
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <div className="grid gap-3 sm:grid-cols-[10rem_1fr]">
        <Field id="tweak-part" label="Part" errors={state.errors?.partRef}>
          <Select id="tweak-part" name="partRef" value={partRef} onChange={(e) => setPartRef(e.target.value)} aria-describedby={describedBy("tweak-part")}>
            <option value="">None (note only)</option>
            {Object.entries(roles).map(([ref, role]) => (
              <option key={ref} value={ref}>
                {ref} — {role.description}
              </option>
            ))}
          </Select>
        </Field>
        {partRef ? (
          <Field
            id="tweak-to"
            label={`New value of ${partRef}${unit ? ` (${unit})` : ""}`}
            hint={current ? `Now ${formatPartValue(current.valueSi, unit)} on the board.` : "Not fitted yet."}
            errors={state.errors?.toValue ?? (effect && "error" in effect && effect.error && !("before" in effect) && toValue ? [effect.error] : undefined)}
          >
            <Input
              id="tweak-to"
              name="toValue"
              value={toValue}
              autoComplete="off"
              spellCheck={false}
              placeholder={unit === "F" ? "e.g. 5p6" : unit === "H" ? "e.g. 12u" : ""}
              onChange={(e) => setToValue(e.target.value)}
              aria-describedby={describedBy("tweak-to")}
              aria-invalid={state.errors?.toValue || (effect && "error" in effect && effect.error) ? true : undefined}
              className="num font-mono"
            />
          </Field>
        ) : (
          <div className="hidden sm:block" />
        )}
      </div>
      {effect && "before" in effect && effect.before !== undefined ? (
        <p className="num rounded-md bg-paper-sunk/60 px-3 py-2 font-mono text-xs text-ink" aria-live="polite">
          {partRef} {formatPartValue(current?.valueSi, unit)} → {formatPartValue(effect.valueSi, unit)}: predicted f0{" "}
          {formatQuantity(effect.before, "Hz", 6)} → <strong>{formatQuantity(effect.after, "Hz", 6)}</strong> ({formatPpm(effect.ppm)})
        </p>
      ) : null}
      <Field id="tweak-note" label="Note" hint="What you did and why: “shortened the leads”, “moved the probe ground”." errors={state.errors?.note}>
        <Textarea id="tweak-note" name="note" rows={2} maxLength={2000} defaultValue={state.values?.note} aria-describedby={describedBy("tweak-note")} />
      </Field>
      <label className="flex items-center gap-2 text-sm text-ink-soft">
        <input type="checkbox" name="planned" value="true" defaultChecked={state.values?.planned === "true"} className="h-4 w-4 accent-copper" />
        Planned only: log it without changing the as-built values yet
      </label>
      <Button type="submit" disabled={pending}>
        {pending ? "Logging…" : "Log tweak"}
      </Button>
    </form>
  );
}
