"use client";

import { Field, Input, Select, Textarea, describedBy } from "@/components/ui/field";
import type { TweakChoice } from "./upload-types";

/** What the technician says about how the capture was taken, as typed (checked when the form is sent). */
export interface MeasurementValues {
  probe: string;
  supply: string;
  temperature: string;
  tweakId: string;
  note: string;
}

export interface UploadMeasurementFieldsProps {
  /** The form's id maker: a field name to a page-unique id. */
  id: (name: string) => string;
  values: MeasurementValues;
  onChange: (name: keyof MeasurementValues, value: string) => void;
  tweaks: TweakChoice[];
  errors: Record<string, string[]>;
  disabled: boolean;
}

/** Probe, supply, temperature, the tweak the run follows and a note: the capture's bench conditions. */
export function UploadMeasurementFields({ id, values, onChange, tweaks, errors, disabled }: UploadMeasurementFieldsProps) {
  return (
    <>
      <Field
        id={id("probe")}
        label="Probe attenuation (×)"
        hint="1 if the scope already scaled the samples for the probe."
        errors={errors.probe}
      >
        <Input
          id={id("probe")}
          inputMode="decimal"
          list={id("probe-list")}
          value={values.probe}
          onChange={(e) => onChange("probe", e.target.value)}
          disabled={disabled}
          aria-describedby={describedBy(id("probe"))}
          aria-invalid={errors.probe ? true : undefined}
          className="num font-mono"
        />
        <datalist id={id("probe-list")}>
          <option value="1" />
          <option value="10" />
          <option value="100" />
        </datalist>
      </Field>
      <OptionalNumberField
        fieldId={id("supply")}
        label="Supply (V)"
        hint="Optional."
        value={values.supply}
        onChange={(v) => onChange("supply", v)}
        placeholder="e.g. 9"
        errors={errors.supplyV}
        disabled={disabled}
      />
      <OptionalNumberField
        fieldId={id("temperature")}
        label="Temperature (°C)"
        hint="Optional: at the board."
        value={values.temperature}
        onChange={(v) => onChange("temperature", v)}
        placeholder="e.g. 23.5"
        errors={errors.temperatureC}
        disabled={disabled}
      />
      <Field
        id={id("tweak")}
        label="This run follows tweak"
        hint="Ties the run to the change it measures."
        errors={errors.tweakId}
        className="sm:col-span-2"
      >
        <Select
          id={id("tweak")}
          value={values.tweakId}
          onChange={(e) => onChange("tweakId", e.target.value)}
          disabled={disabled}
          aria-describedby={describedBy(id("tweak"))}
        >
          <option value="">No tweak (as built)</option>
          {tweaks.map((t) => (
            <option key={t.id} value={t.id}>
              {t.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field id={id("note")} label="Note" hint="Optional: what you did or saw." errors={errors.note} className="sm:col-span-2">
        <Textarea
          id={id("note")}
          rows={2}
          value={values.note}
          onChange={(e) => onChange("note", e.target.value)}
          disabled={disabled}
          aria-describedby={describedBy(id("note"))}
        />
      </Field>
    </>
  );
}

/** A decimal input with its label, hint and errors, for the optional bench readings. */
function OptionalNumberField(props: {
  fieldId: string;
  label: string;
  hint: string;
  value: string;
  onChange: (value: string) => void;
  placeholder: string;
  errors: string[] | undefined;
  disabled: boolean;
}) {
  const { fieldId, errors } = props;
  return (
    <Field id={fieldId} label={props.label} hint={props.hint} errors={errors}>
      <Input
        id={fieldId}
        inputMode="decimal"
        value={props.value}
        onChange={(e) => props.onChange(e.target.value)}
        disabled={props.disabled}
        placeholder={props.placeholder}
        aria-describedby={describedBy(fieldId)}
        aria-invalid={errors ? true : undefined}
        className="num font-mono"
      />
    </Field>
  );
}
