"use client";

import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field, Input, Select, describedBy } from "@/components/ui/field";
import { SpecPresetPicker } from "@/components/review/spec-preset-picker";
import { applyPresetToText, specOfText } from "@/components/review/spec-preset-draft";
import type { SpecDraft } from "./design-draft";

const TEXT_SPEC_KEYS: ReadonlyArray<keyof SpecDraft> = ["targetHz", "maxRmsJitterS", "maxStartUpS", "phaseNoiseOffsetHz"];

export function SpecFields({
  spec,
  setSpec,
  errorsFor,
}: {
  spec: SpecDraft;
  setSpec: (patch: Partial<SpecDraft>) => void;
  errorsFor: (path: string, text: string) => string[] | undefined;
}) {
  const text = (key: keyof SpecDraft, label: string, opts: { hint?: string; placeholder?: string } = {}) => {
    const path = `spec.${key}`;
    const id = `spec-${key}`;
    const value = spec[key];
    const errors = errorsFor(path, value);
    return (
      <Field id={id} label={label} hint={opts.hint} errors={errors}>
        <Input
          id={id}
          name={path}
          value={value}
          // Fields written with a prefix or unit ("412.3k", "50 ps") need the full keyboard on a phone.
          inputMode={TEXT_SPEC_KEYS.includes(key) ? "text" : "decimal"}
          autoComplete="off"
          placeholder={opts.placeholder}
          onChange={(e) => setSpec({ [key]: e.target.value } as Partial<SpecDraft>)}
          aria-describedby={describedBy(id)}
          aria-invalid={errors ? true : undefined}
          className="num font-mono"
        />
      </Field>
    );
  };
  return (
    <Card>
      <CardHeader title="Spec" description="Every limit is optional; runs are judged against the ones you set." />
      <CardBody className="space-y-4">
        <div className="grid gap-4 sm:grid-cols-2">
          {text("targetHz", "Target frequency", { placeholder: "e.g. 412.3k or 1.5 MHz" })}
          <Field id="spec-toleranceValue" label="Frequency tolerance ±" errors={errorsFor("spec.toleranceValue", spec.toleranceValue)}>
            <div className="flex gap-2">
              <Input
                id="spec-toleranceValue"
                name="spec.toleranceValue"
                value={spec.toleranceValue}
                inputMode="decimal"
                autoComplete="off"
                placeholder="e.g. 0.5"
                onChange={(e) => setSpec({ toleranceValue: e.target.value })}
                aria-describedby={describedBy("spec-toleranceValue")}
                aria-invalid={errorsFor("spec.toleranceValue", spec.toleranceValue) ? true : undefined}
                className="num min-w-0 flex-1 font-mono"
              />
              <label htmlFor="spec-toleranceUnit" className="sr-only">
                Tolerance unit
              </label>
              <div className="w-24 shrink-0">
                <Select
                  id="spec-toleranceUnit"
                  name="spec.toleranceUnit"
                  value={spec.toleranceUnit}
                  onChange={(e) => setSpec({ toleranceUnit: e.target.value as SpecDraft["toleranceUnit"] })}
                >
                  <option value="percent">%</option>
                  <option value="ppm">ppm</option>
                </Select>
              </div>
            </div>
          </Field>
          {text("maxThdPercent", "Maximum THD (%)", { placeholder: "e.g. 1" })}
          {text("maxHarmonicDbc", "Maximum single harmonic (dBc)", { hint: "0 or below: −40 means every harmonic 40 dB under the fundamental.", placeholder: "e.g. -40" })}
          {text("minFundamentalVpk", "Minimum amplitude (V peak)", { placeholder: "e.g. 0.5" })}
          {text("maxDriftPpm", "Maximum drift within one record (ppm)", { placeholder: "e.g. 50" })}
        </div>
        <fieldset className="space-y-3">
          <legend className="text-sm font-semibold text-ink">Stability (optional)</legend>
          <p className="text-xs text-ink-soft">
            Jitter, phase noise and start-up are judged on each capture; pushing and the temperature coefficient on the build&apos;s runs together. A figure a capture
            cannot measure is &quot;cannot judge&quot;, never a pass.
          </p>
          <div className="grid gap-4 sm:grid-cols-2">
            {text("maxRmsJitterS", "Maximum rms jitter", { hint: "A time: 50 ps, 1 ns.", placeholder: "e.g. 50 ps" })}
            {text("maxStartUpS", "Longest start-up time", { hint: "First visible oscillation to 90 % of the settled amplitude.", placeholder: "e.g. 2 ms" })}
            {text("phaseNoiseOffsetHz", "Phase-noise offset", { hint: "Judged only where a capture has an estimate at this offset.", placeholder: "e.g. 10k" })}
            {text("maxPhaseNoiseDbcPerHz", "Maximum phase noise at that offset (dBc/Hz)", { placeholder: "e.g. -100" })}
            {text("maxPushingPpmPerV", "Maximum pushing (ppm/V, as a size)", { placeholder: "e.g. 20" })}
            {text("maxTempcoPpmPerK", "Maximum temperature coefficient (ppm/K, as a size)", { placeholder: "e.g. 50" })}
          </div>
        </fieldset>
        <SpecPresetPicker spec={specOfText(spec)} onApply={(preset) => setSpec(applyPresetToText(spec, preset.id))} />
      </CardBody>
    </Card>
  );
}
