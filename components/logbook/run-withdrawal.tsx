"use client";

import { useActionState, useEffect, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { describedBy, Field, FormMessage, Textarea } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { formatDateTime } from "@/lib/format/dates";

type Action = (prev: FormState, formData: FormData) => Promise<FormState>;

export interface RunWithdrawalCardProps {
  filename: string;
  /** The run's withdrawal, or null while it counts. */
  withdrawal: { withdrawnAt: Date | string; withdrawnByName: string; reason: string } | null;
  /** Whether the signed-in person may withdraw and restore (the roles that edit the build). */
  canWithdraw: boolean;
  /** withdrawRunAction bound to the run id; reads `reason`. */
  withdraw: Action;
  /** restoreRunAction bound to the run id. */
  restore: Action;
}

/**
 * Withdraw a run from the figures, or restore it. A withdrawn run is never deleted: it stays on its build's list,
 * marked, and this card says who withdrew it and why. Withdrawing asks for a reason, then for a confirmation.
 */
export function RunWithdrawalCard({ filename, withdrawal, canWithdraw, withdraw, restore }: RunWithdrawalCardProps) {
  if (withdrawal) return <WithdrawnNotice filename={filename} withdrawal={withdrawal} canWithdraw={canWithdraw} restore={restore} />;
  if (!canWithdraw) return null;
  return <WithdrawForm filename={filename} withdraw={withdraw} />;
}

function WithdrawnNotice({
  filename,
  withdrawal,
  canWithdraw,
  restore,
}: Pick<RunWithdrawalCardProps, "filename" | "canWithdraw" | "restore"> & { withdrawal: NonNullable<RunWithdrawalCardProps["withdrawal"]> }) {
  const [state, formAction, pending] = useActionState(restore, {} as FormState);
  return (
    <Card aria-labelledby="run-withdrawn-title" data-testid="run-withdrawn">
      <CardHeader
        title={
          <span id="run-withdrawn-title">
            <span aria-hidden="true">⊘ </span>Withdrawn run
          </span>
        }
        description={`Withdrawn ${formatDateTime(withdrawal.withdrawnAt)} by ${withdrawal.withdrawnByName}. It stays in the logbook, but the build's charts, trend and verdict, the lab's layout figures and comparisons leave it out.`}
      />
      <CardBody className="space-y-3">
        <p className="text-sm text-ink">
          <span className="font-medium">Reason:</span> {withdrawal.reason}
        </p>
        {canWithdraw ? (
          <form action={formAction} className="space-y-2">
            <Button type="submit" variant="secondary" size="sm" disabled={pending} aria-label={`Restore the run ${filename} into the figures`}>
              {pending ? "Restoring…" : "Restore this run"}
            </Button>
            <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
          </form>
        ) : null}
      </CardBody>
    </Card>
  );
}

function WithdrawForm({ filename, withdraw }: Pick<RunWithdrawalCardProps, "filename" | "withdraw">) {
  const [state, formAction, pending] = useActionState(withdraw, {} as FormState);
  const [step, setStep] = useState<"closed" | "reason" | "confirm">("closed");
  const [reason, setReason] = useState("");
  const id = "withdraw-reason";
  const confirmId = "withdraw-confirm";

  // Focus follows the step, so the whole flow works from the keyboard.
  useEffect(() => {
    if (step === "reason") document.getElementById(id)?.focus();
    if (step === "confirm") document.getElementById(confirmId)?.focus();
  }, [step]);
  // A refusal from the server (e.g. the reason was too short) goes back to the reason step.
  useEffect(() => {
    if (state.errors?.reason) setStep("reason");
  }, [state]);

  const errors = state.errors?.reason;
  // The first submit only moves on to the confirmation; the second one sends the form.
  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    if (step !== "reason") return;
    event.preventDefault();
    if (reason.trim().length >= 3) setStep("confirm");
    else document.getElementById(id)?.focus();
  };
  return (
    <Card aria-labelledby="run-withdraw-title">
      <CardHeader
        title={<span id="run-withdraw-title">Withdraw this run</span>}
        description="For a capture that should not count (wrong probe setting, the wrong board on the bench). Nothing is deleted, and it can be restored."
      />
      <CardBody className="space-y-3">
        {step === "closed" ? (
          <Button variant="secondary" size="sm" onClick={() => setStep("reason")}>
            Withdraw…
          </Button>
        ) : (
          <form action={formAction} className="space-y-3" onSubmit={onSubmit}>
            <Field id={id} label="Why is this run withdrawn?" hint="Required. Kept with the run and in the audit log." errors={errors}>
              <Textarea
                id={id}
                name="reason"
                rows={2}
                required
                minLength={3}
                maxLength={2000}
                value={reason}
                onChange={(e) => setReason(e.target.value)}
                readOnly={step === "confirm"}
                aria-describedby={describedBy(id)}
                aria-invalid={errors ? true : undefined}
              />
            </Field>
            {step === "reason" ? (
              <div className="flex flex-wrap gap-2">
                <Button type="submit" size="sm" variant="danger">
                  Continue
                </Button>
                <Button size="sm" variant="ghost" onClick={() => setStep("closed")}>
                  Cancel
                </Button>
              </div>
            ) : (
              <div role="group" aria-labelledby="withdraw-confirm-text" className="space-y-2 rounded-md border border-verdict-fail/40 bg-verdict-failBg px-3 py-2">
                <p id="withdraw-confirm-text" className="text-sm text-ink">
                  Withdraw <span className="break-all font-medium">{filename}</span>? The build&apos;s charts, trend and verdict, the lab&apos;s figures
                  and comparisons will leave it out.
                </p>
                <div className="flex flex-wrap gap-2">
                  <Button id={confirmId} type="submit" size="sm" variant="danger" disabled={pending}>
                    {pending ? "Withdrawing…" : "Yes, withdraw the run"}
                  </Button>
                  <Button size="sm" variant="ghost" onClick={() => setStep("reason")} disabled={pending}>
                    Back
                  </Button>
                </div>
              </div>
            )}
            <FormMessage message={state.ok ? null : state.message} />
          </form>
        )}
      </CardBody>
    </Card>
  );
}
