// Debian packages the project's own scripts install when they are missing (PostgreSQL and Chromium for
// `npm start` and `npm test`, numpy and pandas for the benchmark's reference pipeline). Plain JavaScript:
// bootstrap.mjs runs it on a fresh machine before `npm install`.
import { spawnSync } from "node:child_process";

/**
 * Installs `packages` with apt-get (update, then install), its output shown as it runs.
 * @param {string[]} packages
 * @param {(line: string) => void} log - told which packages are being installed
 * @throws Error naming the command to run by hand when this is not root, or the apt-get step that failed
 */
export function aptInstall(packages, log) {
  if (process.getuid?.() !== 0) {
    throw new Error(`missing Debian packages (${packages.join(", ")}); install them with: sudo apt-get install -y ${packages.join(" ")}`);
  }
  log(`installing Debian packages: ${packages.join(", ")}`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [["update", "-qq"], ["install", "-y", "-qq", ...packages]]) {
    const step = spawnSync("apt-get", args, { stdio: "inherit", env });
    if (step.status !== 0) throw new Error(`apt-get ${args.join(" ")} failed with exit ${step.status}`);
  }
}
