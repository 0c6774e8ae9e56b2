import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";
import { cn } from "@/lib/utils";

const control =
  "block w-full rounded-md border border-rule-strong bg-paper-raised px-2.5 py-1.5 text-sm text-ink placeholder:text-ink-faint focus:border-copper aria-[invalid=true]:border-verdict-fail";

export function Input({ className, ...props }: InputHTMLAttributes<HTMLInputElement>) {
  return <input className={cn(control, "h-9", className)} {...props} />;
}

export function Textarea({ className, ...props }: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea className={cn(control, className)} {...props} />;
}

export function Select({ className, ...props }: SelectHTMLAttributes<HTMLSelectElement>) {
  return <select className={cn(control, "h-9", className)} {...props} />;
}

export interface FieldProps {
  /** The id of the control inside, so the label and the error are tied to it. */
  id: string;
  label: string;
  hint?: ReactNode;
  errors?: string[];
  children: ReactNode;
  className?: string;
}

/**
 * A labelled control with its hint and its errors. The control must carry `id`, and should set
 * `aria-describedby={describedBy(id)}` and `aria-invalid` when there are errors.
 */
export function Field({ id, label, hint, errors, children, className }: FieldProps) {
  return (
    <div className={cn("space-y-1", className)}>
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint ? (
        <p id={`${id}-hint`} className="text-xs text-ink-faint">
          {hint}
        </p>
      ) : null}
      <div id={`${id}-error`} aria-live="polite">
        {errors?.map((e) => (
          <p key={e} className="text-xs font-medium text-verdict-fail">
            {e}
          </p>
        ))}
      </div>
    </div>
  );
}

export function describedBy(id: string): string {
  return `${id}-hint ${id}-error`;
}

/** A form-level message (the `message` of an action's state). */
export function FormMessage({ message, tone = "error" }: { message?: string | null; tone?: "error" | "success" }) {
  return (
    <div aria-live="polite" role={tone === "error" ? "alert" : "status"}>
      {message ? (
        <p
          className={cn(
            "rounded-md border px-3 py-2 text-sm",
            tone === "error"
              ? "border-verdict-fail/40 bg-verdict-failBg text-verdict-fail"
              : "border-verdict-pass/40 bg-verdict-passBg text-verdict-pass",
          )}
        >
          {message}
        </p>
      ) : null}
    </div>
  );
}
