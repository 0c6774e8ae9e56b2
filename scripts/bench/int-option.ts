/**
 * A benchmark's integer option, `min..max`, or the command stops with status 2 and one line naming the option and
 * its bounds (the benchmarks keep their loads bounded on purpose).
 * @param command - the command's name for the message, e.g. "bench:web"
 */
export function intOption(command: string, name: string, raw: string, min: number, max: number): number {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) {
    console.error(`${command}: --${name} must be an integer ${min}..${max}; got "${raw}"`);
    process.exit(2);
  }
  return n;
}
