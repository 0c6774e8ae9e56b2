import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { closeCampaignClients, createFixture, DEFAULT_SEED, formatReport, runCampaign, type Fixture } from "../../scripts/fuzz/campaign";
import { INPUT_CLASSES } from "../../scripts/fuzz/inputs";
import { appUrl } from "../helpers/stack";

// The first inputs of `npm run fuzz`'s campaign (same seed, same order), so a failure here replays there by its
// index: JSON bodies, query strings, path segments, headers, multipart envelopes and CSV captures, sent by every
// role (API tokens and signed-in session cookies) and by nobody. No 5xx, no refusal that stored a row or an
// object, every /api refusal problem+json, and /api/health answering throughout.

const SLICE_INPUTS = 480;
let fixture: Fixture;

beforeAll(async () => {
  fixture = await createFixture(appUrl(), "fuzz-slice");
}, 120_000);

afterAll(async () => {
  closeCampaignClients();
  await closeDb();
  await closeLucia();
});

describe("the seeded fuzz slice", () => {
  it(`answers ${SLICE_INPUTS} hostile inputs without a 5xx, stores nothing on refusal and keeps health answering`, async () => {
    const report = await runCampaign({ baseUrl: appUrl(), seed: DEFAULT_SEED, inputs: SLICE_INPUTS, fixture });
    const text = formatReport(report);
    console.log(text);
    expect(report.serverErrors, text).toEqual([]);
    expect(report.noAnswer, text).toEqual([]);
    expect(report.storedOnRefusal, text).toEqual([]);
    expect(report.notProblemJson, text).toEqual([]);
    expect(report.uncheckedRefusals.length, text).toBeLessThan(5);
    for (const c of INPUT_CLASSES) expect(report.perClass[c], `${c} inputs`).toBeGreaterThan(20);
    expect(report.refused).toBeGreaterThan(SLICE_INPUTS / 3);
    expect(report.health.samples).toBeGreaterThan(0);
    expect(report.health.failures, text).toBe(0);
    // The per-input check counts the fake S3's files; the S3 API must list as many, or the check counted the wrong thing.
    expect(report.objects.listed, text).not.toBeNull();
    expect(report.objects.counted, text).toBe(report.objects.listed);
    expect(report.objects.counted).toBeGreaterThan(0);
  }, 240_000);
});
