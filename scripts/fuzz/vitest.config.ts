import path from "node:path";
import { defineConfig } from "vitest/config";

// `npm run fuzz`: the whole campaign, on the test stack that scripts/bootstrap.mjs starts for it, as its only
// test file (the slice of it in `npm test` is tests/integration/fuzz.test.ts).
export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname, "../..") } },
  test: {
    include: ["scripts/fuzz/*.fuzz.ts"],
    fileParallelism: false,
    testTimeout: 60 * 60_000,
    hookTimeout: 300_000,
  },
});
