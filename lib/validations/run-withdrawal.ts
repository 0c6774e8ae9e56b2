import "./zod-config";
import { z } from "zod";

/** Longest withdrawal reason kept, characters. */
export const MAX_WITHDRAWAL_REASON = 2000;

const REASON_MESSAGE = "Say why the run is withdrawn (e.g. \"probe on ×1, not ×10\"), so the next reader knows.";

/** Withdraw a run: the reason is required, trimmed, never blank. */
export const runWithdrawalInputSchema = z.object({
  reason: z
    .string({ error: REASON_MESSAGE })
    .trim()
    .min(3, REASON_MESSAGE)
    .max(MAX_WITHDRAWAL_REASON, `The reason takes at most ${MAX_WITHDRAWAL_REASON} characters.`),
});

export type RunWithdrawalInput = z.output<typeof runWithdrawalInputSchema>;
