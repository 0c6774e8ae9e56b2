import type { ZodError } from "zod";
import { zodFields } from "@/lib/http/problem";
import { formFields, stateFromError, type FormState } from "@/lib/auth/action-state";
import { formDataToObject } from "@/lib/validations/common";

// Shared by the logbook's server actions: field errors keyed by the full dotted path ("parts.C1.value",
// "spec.targetHz") so each shows beside its field, and the typed text kept so a refused form is not emptied.

/** The state for a zod failure, keeping what was typed. */
export function invalidForm(error: ZodError, formData: FormData): FormState {
  return { errors: zodFields(error), message: "Check the highlighted fields.", values: formFields(formData) };
}

/** The state for an error a service threw, keeping what was typed. */
export function failedForm(err: unknown, formData: FormData): FormState {
  return { ...stateFromError(err), values: formFields(formData) };
}

/** The form as nested fields (dotted names become objects). */
export function formObject(formData: FormData): Record<string, unknown> {
  return formDataToObject(formData);
}
