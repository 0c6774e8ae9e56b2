// Where next-server's time went under the bench's load: the .cpuprofile that `--cpu-prof` writes when the
// server stops, summed by self time per part of the stack (Next's runtime, Node's HTTP and streams, the database
// driver, our bundled code) and the heaviest functions.
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  children?: number[];
}

interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

/** The part of the stack a function belongs to, by its script's URL. */
function partOf(url: string, name: string): string {
  if (name === "(idle)") return "idle (waiting for I/O)";
  if (name === "(garbage collector)") return "garbage collector";
  if (name === "(program)" || name === "(root)") return "V8 / native (program)";
  if (url.startsWith("node:")) return /http|_stream|net|stream|tls|dns|socket/.test(url) ? "Node HTTP, net and streams" : "Node other";
  if (url.includes("/node_modules/next/")) return "Next.js runtime";
  if (/\/node_modules\/(pg|pg-[a-z-]+|postgres-[a-z-]+)\//.test(url)) return "pg driver";
  if (url.includes("/node_modules/knex/")) return "knex";
  if (url.includes("/node_modules/")) return `other packages (${url.split("/node_modules/")[1]?.split("/")[0]})`;
  if (url.includes("/.next")) return "app bundle (our code and bundled packages)";
  return url ? "other scripts" : "native";
}

export function printProfileSummary(dir: string, log: (line: string) => void): void {
  if (!existsSync(dir)) return log(`no CPU profile in ${dir} (did next-server exit cleanly?)`);
  const files = readdirSync(dir).filter((f) => f.endsWith(".cpuprofile"));
  if (files.length === 0) return log(`no CPU profile in ${dir}`);
  // next-server is the largest profile written (the CLI wrapper's, if any, is tiny).
  const file = files.map((f) => path.join(dir, f)).sort((a, b) => statSync(b).size - statSync(a).size)[0];
  const profile = JSON.parse(readFileSync(file, "utf8")) as CpuProfile;
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const selfUs = new Map<number, number>();
  profile.samples.forEach((id, i) => selfUs.set(id, (selfUs.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));

  const parts = new Map<string, number>();
  const functions = new Map<string, number>();
  let busyUs = 0;
  for (const [id, us] of selfUs) {
    const node = byId.get(id)!;
    const { functionName, url, lineNumber } = node.callFrame;
    const part = partOf(url, functionName);
    parts.set(part, (parts.get(part) ?? 0) + us);
    if (part.startsWith("idle")) continue;
    busyUs += us;
    const where = url ? `${url.replace(/^.*\/(node_modules|\.next-bench)\//, "$1/")}:${lineNumber + 1}` : "";
    const key = `${functionName || "(anonymous)"} ${where}`;
    functions.set(key, (functions.get(key) ?? 0) + us);
  }
  log(`CPU profile of next-server: ${file}`);
  log(`busy ${(busyUs / 1e6).toFixed(1)} s; by part of the stack (share of busy time):`);
  for (const [part, us] of [...parts].sort((a, b) => b[1] - a[1])) {
    if (part.startsWith("idle")) continue;
    log(`  ${((100 * us) / busyUs).toFixed(1).padStart(5)} %  ${part}`);
  }
  log("heaviest functions by self time:");
  for (const [key, us] of [...functions].sort((a, b) => b[1] - a[1]).slice(0, 20)) log(`  ${((100 * us) / busyUs).toFixed(1).padStart(5)} %  ${key}`);
}
