import { z } from "zod";

export const createTokenSchema = z.object({
  name: z
    .string({ error: "Name the token after the script or bench that will use it." })
    .trim()
    .min(1, "Name the token after the script or bench that will use it.")
    .max(60, "Use at most 60 characters."),
});

export const revokeTokenSchema = z.object({ tokenId: z.string().min(1).max(64) });
