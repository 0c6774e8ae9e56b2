// What the local fake services' command lines share: port arguments and a clean stop on Ctrl-C or SIGTERM.

/** The port in `raw`, or exit 2 with a message naming the option (0 picks a free port). */
export function portArgument(service: string, option: string, raw: string): number {
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`${service}: --${option} must be an integer 0..65535, got "${raw}"`);
    process.exit(2);
  }
  return port;
}

/** Closes the server once on SIGINT or SIGTERM, then exits 0 (1 if closing failed). */
export function stopOnSignals(service: string, server: { close(): Promise<void> }): void {
  let stopping = false;
  const stop = async (signal: string): Promise<void> => {
    if (stopping) return;
    stopping = true;
    try {
      await server.close();
      process.exit(0);
    } catch (err) {
      console.error(`${service}: error while stopping on ${signal}:`, err);
      process.exit(1);
    }
  };
  process.on("SIGINT", () => void stop("SIGINT"));
  process.on("SIGTERM", () => void stop("SIGTERM"));
}
