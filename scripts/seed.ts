// `npx tsx scripts/seed.ts [--allow-production] [--accounts-file PATH]`: the demo data `npm start` loads once. Each step checks
// whether its data is already there, so running it again changes nothing. Add a step by importing its
// function and appending it to `steps`.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { generateIdFromEntropySize } from "lucia";
import { closeDb, db } from "../db/index";
import { recordAudit } from "../db/queries/audit";
import { createUser, getUserByEmail, type User } from "../db/queries/users";
import { closeLucia } from "../lib/auth/lucia";
import { hashPassword } from "../lib/auth/password";
import type { Role } from "../lib/auth/permissions";
import { seedDemoLogbook } from "./seed/logbook";
import { seedLayoutSurvey } from "./seed/layouts";
import { seedSensitivityDemo } from "./seed/sensitivity";

/** What earlier steps made, for later ones (e.g. whose name a demo build goes under). */
export interface SeedContext {
  accounts: Record<Role, User>;
  log: (line: string) => void;
}

export interface SeedStep {
  name: string;
  run: (ctx: SeedContext) => Promise<void>;
}

/** Demo-only: printed by `npm start` and stated in the README. Never used outside the demo.test accounts. */
export const DEMO_PASSWORD = "bench-demo-2026";

const demoPeople: { role: Role; email: string; name: string }[] = [
  { role: "viewer", email: "vera.viewer@demo.test", name: "Vera Lindqvist" },
  { role: "technician", email: "tom.tech@demo.test", name: "Tomás Okafor" },
  { role: "engineer", email: "erin.eng@demo.test", name: "Erin Halvorsen" },
  { role: "admin", email: "ada.admin@demo.test", name: "Ada Moreau" },
];

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const args = parseArgs({
  options: { "allow-production": { type: "boolean", default: false }, "accounts-file": { type: "string" } },
  strict: true,
}).values;
/** Where `npm start` (scripts/bootstrap.mjs) looks for the block it prints. */
const accountsFile = path.resolve(args["accounts-file"] ?? path.join(root, ".data", "demo-accounts.txt"));

/** One account per role on demo.test (RFC 6761 reserves .test), created when missing. */
async function seedDemoAccounts(ctx: SeedContext): Promise<void> {
  let passwordHash: string | null = null;
  for (const person of demoPeople) {
    let user = await getUserByEmail(person.email);
    if (!user) {
      passwordHash ??= await hashPassword(DEMO_PASSWORD);
      user = await createUser({ id: generateIdFromEntropySize(10), email: person.email, name: person.name, role: person.role, passwordHash });
      await recordAudit({ actorId: null, action: "user.seeded", entityType: "user", entityId: user.id, detail: { email: user.email, role: user.role } });
      ctx.log(`created demo ${person.role} ${person.email}`);
    }
    ctx.accounts[person.role] = user;
  }
  const width = Math.max(...demoPeople.map((p) => p.email.length));
  const lines = [
    "",
    "Demo accounts (demo data only; every one uses the same password):",
    ...demoPeople.map((p) => `  ${p.role.padEnd(10)} ${p.email.padEnd(width)}  ${p.name}`),
    `  password   ${DEMO_PASSWORD}`,
    "",
  ];
  mkdirSync(path.dirname(accountsFile), { recursive: true });
  writeFileSync(accountsFile, lines.join("\n"));
}

const steps: SeedStep[] = [
  { name: "demo accounts", run: seedDemoAccounts },
  { name: "demo logbook", run: seedDemoLogbook },
  { name: "layout survey", run: seedLayoutSurvey },
  { name: "sensitivity demo", run: seedSensitivityDemo },
];

async function main(): Promise<number> {
  if (process.env.NODE_ENV === "production" && !args["allow-production"]) {
    console.error("seed: refusing to load demo accounts with NODE_ENV=production; pass --allow-production if you really mean it");
    return 2;
  }
  const ctx: SeedContext = { accounts: {} as Record<Role, User>, log: (line) => console.log(`[seed] ${line}`) };
  try {
    await db().raw("select 1");
    for (const step of steps) await step.run(ctx);
    return 0;
  } catch (err) {
    console.error(`seed failed: ${err instanceof Error ? err.message : String(err)}`);
    return 1;
  } finally {
    await closeDb();
    await closeLucia();
  }
}

main().then((code) => process.exit(code));
