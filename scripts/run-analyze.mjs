#!/usr/bin/env node
// Runs the `analyze` command without tsx: tsx's loader costs about a quarter of a second at every
// start, as much as the whole analysis of a million-sample capture. The command (scripts/analyze.ts
// and lib/analysis) is bundled once with esbuild into node_modules/.cache (git-ignored) and
// rebuilt whenever a source file is newer than the bundle; then node runs the bundle directly.
import { mkdirSync, readdirSync, renameSync, statSync } from "node:fs";
import v8 from "node:v8";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const entry = path.join(root, "scripts", "analyze.ts");
const workerEntry = path.join(root, "scripts", "analyze-spectrum-worker.ts");
const outdir = path.join(root, "node_modules", ".cache", "tankbook-tools");
const bundle = path.join(outdir, "analyze.mjs");

function newestSourceMs() {
  let newest = Math.max(statSync(entry).mtimeMs, statSync(workerEntry).mtimeMs, statSync(fileURLToPath(import.meta.url)).mtimeMs);
  const dir = path.join(root, "lib", "analysis");
  // One level of subfolders (lib/analysis/stability, lib/analysis/parse): a folder's own mtime does not change when a file in it is edited.
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    newest = Math.max(newest, statSync(full).mtimeMs);
    if (entry.isDirectory()) for (const name of readdirSync(full)) newest = Math.max(newest, statSync(path.join(full, name)).mtimeMs);
  }
  // lib/analysis's one import from outside itself: the engineering-notation formatter of its messages.
  newest = Math.max(newest, statSync(path.join(root, "lib", "oscillator", "units.ts")).mtimeMs);
  newest = Math.max(newest, statSync(path.join(root, "package-lock.json")).mtimeMs);
  return newest;
}

function bundleMs() {
  try {
    return statSync(bundle).mtimeMs;
  } catch {
    return -Infinity;
  }
}

if (bundleMs() < newestSourceMs()) {
  const { build } = await import("esbuild");
  mkdirSync(outdir, { recursive: true });
  // Build to private names and rename, so two commands started together never run half a file;
  // the worker goes first, as the command's bundle is what marks the pair fresh.
  for (const [source, name] of [
    [workerEntry, "analyze-spectrum-worker.mjs"],
    [entry, "analyze.mjs"],
  ]) {
    const target = path.join(outdir, name);
    const partial = `${target}.${process.pid}.partial.mjs`;
    await build({
      entryPoints: [source],
      outfile: partial,
      bundle: true,
      platform: "node",
      format: "esm",
      target: "node20",
      logLevel: "error",
      banner: { js: "import { createRequire as __tankbookRequire } from 'node:module'; const require = __tankbookRequire(import.meta.url);" },
    });
    renameSync(partial, target);
  }
}

// A long loop's optimised (OSR) code is compiled on a background thread by default, and the loop
// keeps running interpreted, boxing every double, until it is ready. This command keeps both cores
// busy (its worker parses and computes the spectrum), so that thread waits for a core: compiling in
// place costs less. CPU time of a 1M-sample run, 8 interleaved pairs: 0.94 → 0.81 s. Flags change
// no result: V8 computes doubles the same way in every tier.
v8.setFlagsFromString("--no-concurrent-osr");
await import(pathToFileURL(bundle).href);
