"use client";

import { useActionState, useState } from "react";
import { CalibratedPredictionPanel, PredictionColumn } from "@/components/layouts/calibrated-prediction-panel";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, describedBy } from "@/components/ui/field";
import type { BuildKind } from "@/db/queries/builds";
import type { FormState } from "@/lib/auth/action-state";
import { constructionKey, constructionName, constructionOf } from "@/lib/layouts/construction";
import type { BuildFormCalibration } from "@/lib/logbook/layouts";
import { BUILD_KIND_NAMES } from "./build-status";

export interface BuildFormProps {
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  /** A label to suggest, e.g. the next free "BB-3". */
  suggestedLabel?: string;
  /** The design's predictions per construction of this lab; without it the form shows no prediction. */
  calibration?: BuildFormCalibration;
}

/** Both predictions for the construction being picked: as designed, and as it will likely measure here. */
function ConstructionPrediction({ calibration, kind, revision }: { calibration: BuildFormCalibration; kind: BuildKind; revision: string }) {
  const construction = constructionOf(kind, revision);
  const key = constructionKey(construction);
  const view = calibration.views.find((v) => v.constructionKey === key);
  return (
    <section aria-labelledby="build-form-prediction" aria-live="polite" className="space-y-2 rounded-md border border-rule bg-paper-sunk/40 px-3 py-2.5">
      <h3 id="build-form-prediction" className="text-sm font-medium text-ink">
        Predicted for {constructionName(construction).replace(/^PCB \(no revision given\)$/, "a PCB")}
      </h3>
      {view ? (
        <CalibratedPredictionPanel view={view} />
      ) : calibration.asDesigned ? (
        <>
          <div className="grid gap-2 sm:grid-cols-2">
            <PredictionColumn title="As designed" figures={calibration.asDesigned} />
          </div>
          <p className="text-xs text-ink-soft">
            No {constructionName(construction)} build of this topology has held its implied capacitance across a tweak here yet, so only the prediction as
            designed is known; this build&apos;s runs will start that figure.
          </p>
        </>
      ) : (
        <p className="text-sm text-verdict-fail">{calibration.error}</p>
      )}
    </section>
  );
}

/** A new build of a design: its label and what kind of board it is, with what that construction predicts here. */
export function BuildForm({ action, suggestedLabel, calibration }: BuildFormProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  const [kind, setKind] = useState<BuildKind>((state.values?.kind as BuildKind | undefined) ?? "breadboard");
  const [revision, setRevision] = useState(state.values?.kindRevision ?? "");
  return (
    <form action={formAction} noValidate className="space-y-3">
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="build-label" label="Label" hint="As written on the board, e.g. BB-1." errors={state.errors?.label}>
          <Input
            id="build-label"
            name="label"
            defaultValue={state.values?.label ?? suggestedLabel}
            maxLength={80}
            aria-describedby={describedBy("build-label")}
            aria-invalid={state.errors?.label ? true : undefined}
          />
        </Field>
        <Field id="build-kind" label="Kind" errors={state.errors?.kind}>
          <Select id="build-kind" name="kind" value={kind} onChange={(e) => setKind(e.target.value as BuildKind)} aria-describedby={describedBy("build-kind")}>
            {Object.entries(BUILD_KIND_NAMES).map(([value, name]) => (
              <option key={value} value={value}>
                {name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="build-kind-revision" label="Board revision" hint="Optional, e.g. rev B." errors={state.errors?.kindRevision}>
          <Input
            id="build-kind-revision"
            name="kindRevision"
            value={revision}
            onChange={(e) => setRevision(e.target.value)}
            maxLength={40}
            aria-describedby={describedBy("build-kind-revision")}
          />
        </Field>
      </div>
      {calibration ? <ConstructionPrediction calibration={calibration} kind={kind} revision={revision} /> : null}
      <p className="text-xs text-ink-faint">The build starts with the design&apos;s current part values; tweaks change them from there.</p>
      <Button type="submit" disabled={pending}>
        {pending ? "Creating…" : "Create build"}
      </Button>
    </form>
  );
}
