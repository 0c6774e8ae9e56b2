// `npm run -s create-token -- --email EMAIL [--name NAME]`: prints a new API token for that user on stdout and
// nothing else (errors go to stderr with exit 1), so `TOKEN=$(npm run -s create-token -- --email …)` works.
import { parseArgs } from "node:util";
import { closeDb } from "../db/index";
import { getUserByEmail } from "../db/queries/users";
import { createApiToken } from "../lib/auth/api-tokens";
import { closeLucia } from "../lib/auth/lucia";
import { createTokenSchema } from "../lib/validations/tokens";
import { emailSchema } from "../lib/validations/auth";

async function main(): Promise<number> {
  let values: { email?: string; name?: string };
  try {
    ({ values } = parseArgs({ options: { email: { type: "string" }, name: { type: "string" } }, strict: true }));
  } catch (err) {
    console.error(`create-token: ${err instanceof Error ? err.message : String(err)}`);
    return 2;
  }
  const email = emailSchema.safeParse(values.email ?? "");
  const name = createTokenSchema.safeParse({ name: values.name ?? `command line ${new Date().toISOString().slice(0, 10)}` });
  if (!email.success || !name.success) {
    console.error("usage: npm run -s create-token -- --email EMAIL [--name NAME]  (NAME: 1–60 characters)");
    return 2;
  }
  try {
    const user = await getUserByEmail(email.data);
    if (!user) {
      console.error(`create-token: no account has the e-mail address ${email.data}`);
      return 1;
    }
    if (user.status !== "active") {
      console.error(`create-token: the account ${email.data} is disabled; enable it on the People page first`);
      return 1;
    }
    const { token } = await createApiToken({ userId: user.id, name: name.data.name });
    process.stdout.write(`${token}\n`);
    return 0;
  } catch (err) {
    console.error(`create-token failed: ${err instanceof Error ? err.message : String(err)}`);
    return 1;
  } finally {
    await closeDb();
    await closeLucia();
  }
}

main().then((code) => process.exit(code));
