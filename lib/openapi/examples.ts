// Example request bodies, shown in the document and on the API page (the curl lines use them). Invented values;
// the document test parses each one with the handler's own schema, so an example cannot drift into being wrong.

const BUILD_ID = "3f2b8c1e-5d4a-4e6b-9a7c-1d2e3f4a5b6c";

export const REQUEST_EXAMPLES = {
  createSession: { email: "you@lab.example", password: "your password" },
  createProject: { name: "Reference oscillators", purpose: "Low-drift 1 MHz sources for the counter bench." },
  updateProject: { purpose: "Low-drift 1 MHz and 4 MHz sources for the counter bench." },
  createDesign: {
    name: "Colpitts 1.04 MHz",
    topology: "colpitts",
    parts: {
      L: { value: "10u", tolerance: "5%" },
      C1: { value: "4n7", tolerance: "5%", tempco: "C0G" },
      C2: { value: "4n7", tolerance: "5%", tempco: "C0G" },
    },
    extraCapacitance: "10p",
    spec: { targetHz: "1.04M", toleranceValue: 1, toleranceUnit: "percent", maxThdPercent: 5, maxHarmonicDbc: -30 },
  },
  reviseDesign: { parts: { C2: { value: "3n9" } }, changeNote: "C2 to 3.9 nF after the first captures ran low." },
  createBuild: { label: "BB-1", kind: "breadboard" },
  logTweak: { partRef: "C2", toValue: "3n9", note: "Swapped C2 to pull the frequency up." },
  requestUploadSlot: { buildId: BUILD_ID, filename: "bb1-after-c2.csv", sizeBytes: 2_400_000 },
  completeUpload: { channel: "CH1", probe: "10x", supplyV: 12, temperatureC: 23.5, note: "After the C2 swap." },
  reviewBuild: { decision: "accept", comment: "Within 0.3 % of target, THD 1.8 %." },
  planRetune: { series: "E24" },
  setBuildTimebase: { timebasePpm: 25 },
  withdrawRun: { reason: "Probe was on ×1, not ×10: the amplitude and THD are wrong." },
} as const;

export type ExampleOperation = keyof typeof REQUEST_EXAMPLES;

/** Example multipart fields of the capture upload (the file itself is `file=@capture.csv`). */
export const UPLOAD_FIELD_EXAMPLES = { channel: "CH1", probe: "10x", note: "After the C2 swap." } as const;
