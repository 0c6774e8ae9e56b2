// Access to the services that `npm test` (scripts/bootstrap.mjs) brought up for this run.
import { isRunning, startCluster, stopCluster } from "../../scripts/lib/postgres.mjs";

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run the suite through \`npm test\`, which starts the test stack`);
  return value;
}

export const appUrl = (): string => required("APP_URL");

/** Stops the test cluster (fault tests); `startPostgres` brings the same cluster back on the same port. */
export function stopPostgres(): void {
  stopCluster(required("TANKBOOK_PG_BIN"), required("TANKBOOK_PG_DATA"));
}

export function startPostgres(): void {
  const bin = required("TANKBOOK_PG_BIN");
  const data = required("TANKBOOK_PG_DATA");
  if (!isRunning(bin, data)) startCluster(bin, data, Number(required("TANKBOOK_PG_PORT")));
}
