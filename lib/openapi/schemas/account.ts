import { z } from "zod";
import { roles } from "@/lib/auth/permissions";
import { documented } from "../documented";
import { isoTime, userId } from "./common";

export const meSchema = documented(
  z.object({
    id: userId,
    email: z.email(),
    name: z.string(),
    role: z.enum(roles).describe("viewer < technician < engineer < admin; each role can do what the ones below can."),
  }),
  { refId: "Me", description: "Who the token or session acts for." },
);

export const sessionCreatedSchema = documented(
  z.object({ user: meSchema, expiresAt: isoTime.describe("When the session ends unless it is used (it is extended on use).") }),
  { refId: "SessionCreated" },
);
