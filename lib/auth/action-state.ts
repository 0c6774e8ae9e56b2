import type { ZodError } from "zod";
import { AppError, UNAVAILABLE_MESSAGES, unavailableService } from "@/lib/errors";
import { MailError } from "@/lib/mail/errors";

/** What a server action hands back to its form: field errors shown beside the fields, one message on top. */
export interface FormState {
  errors?: Record<string, string[]>;
  message?: string | null;
  /** True after a successful change, to show `message` as a confirmation. */
  ok?: boolean;
  /** A value to show once, e.g. a newly created API token. */
  secret?: string;
  /**
   * What the person typed (never passwords), so a refused form is not emptied: React 19 resets a form after
   * its action, and the inputs take these back as their default values.
   */
  values?: Record<string, string>;
}

/** The state with the given typed values kept for the form. */
export function keepValues(state: FormState, values: Record<string, string | undefined>): FormState {
  const kept: Record<string, string> = {};
  for (const [k, v] of Object.entries(values)) if (typeof v === "string") kept[k] = v;
  return { ...state, values: kept };
}

/** Field errors of a zod failure keyed by the first path segment (the form field's name). */
export function fieldErrors(error: ZodError): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? "form");
    (errors[key] ??= []).push(issue.message);
  }
  return errors;
}

/** The state for a zod failure. */
export function invalidState(error: ZodError): FormState {
  return { errors: fieldErrors(error), message: "Check the highlighted fields." };
}

/**
 * Turns what a service threw into form state: domain errors keep their sentence (and field errors),
 * mail failures say the e-mail could not go out, anything else is logged and reported without detail.
 */
export function stateFromError(err: unknown): FormState {
  if (err instanceof AppError) return { message: err.message, errors: err.fields };
  if (err instanceof MailError) {
    console.error("mail failed in a server action:", err.message);
    return { message: "The e-mail could not be sent just now. Try again in a minute; if it keeps failing, tell your admin." };
  }
  const unavailable = unavailableService(err);
  if (unavailable) {
    console.error(`server action: ${unavailable} unavailable: ${err instanceof Error ? err.message : String(err)}`);
    return { message: UNAVAILABLE_MESSAGES[unavailable] };
  }
  console.error("unexpected error in a server action:", err);
  return { message: "Something failed on the server. Nothing was changed; try again." };
}

/** A FormData as a plain object of its string fields (files and repeated keys are not used by these forms). */
export function formFields(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of formData.entries()) if (typeof v === "string" && !k.startsWith("$ACTION")) out[k] = v;
  return out;
}
