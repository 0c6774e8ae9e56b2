// Descriptions of request fields and query parameters. The schemas themselves belong to lib/validations and are
// used unchanged; these words are laid onto the generated document. A note naming a field the schema no longer
// has is reported by applyNotes (and fails the document test), so the notes cannot outlive the fields.

/** Request body components → field → description. */
export const FIELD_NOTES: Record<string, Record<string, string>> = {
  SignIn: {
    email: "The account's e-mail address (compared case-insensitively).",
    password: "The account's password.",
    next: "A same-site path to return to (browser flows); ignored by scripts.",
  },
  ProjectInput: { name: "Unique across projects, at most 120 characters.", purpose: "What the project is for (optional)." },
  ProjectPatch: { name: "New name (unique across projects).", purpose: "New purpose." },
  DesignInput: {
    name: "Unique within the project.",
    topology: "tank, colpitts, hartley or clapp.",
    parts: "Parts by reference: `{\"L\": {\"value\": \"10u\", \"tolerance\": \"5%\"}, \"C1\": {\"value\": 1e-9}, …}`.",
    extraCapacitance: "Extra capacitance across the tank (stray, probe), F or text such as “3p3”.",
    windings: "Hartley only: aiding or opposing.",
    spec: "The limits runs are judged against; every limit optional.",
    changeNote: "Why this revision (shown in the history).",
  },
  DesignPatch: {
    name: "New name.",
    parts: "Parts to change, by reference; the others keep their values.",
    extraCapacitance: "New extra capacitance; \"\" or null clears it.",
    windings: "Hartley only: aiding or opposing.",
    spec: "A new spec (replaces the whole spec).",
    changeNote: "Why this revision.",
  },
  BuildInput: {
    label: "Unique within the design, e.g. “BB-1”.",
    kind: "breadboard, perfboard, pcb or other.",
    kindRevision: "Free text beside the kind, e.g. “rev B”.",
    builtBy: "Account id of who built it; the caller when left out.",
  },
  TweakInput: {
    partRef: "The part changed (a reference of the build's topology); leave out for a note-only tweak.",
    toValue: "The part's new value: SI number or text (“3n9”, “10 µH”).",
    note: "What was done and why.",
    planned: "true logs the change without applying it to the as-built values.",
  },
  RunUpload: {
    channel: "Which voltage column to analyse, as the CSV header names it; the first one when left out.",
    probe: "Probe attenuation: 1, 10, “10x”, “x10” or “10:1” (default 1).",
    supplyV: "Supply voltage during the capture, V.",
    temperatureC: "Temperature during the capture, °C.",
    note: "Free text for the logbook.",
    tweakId: "The tweak this capture follows (one of this build's).",
    keepDuplicate: "true keeps a second copy of a file already logged on this build (otherwise 409).",
  },
  UploadSlotRequest: {
    buildId: "The build the capture belongs to.",
    filename: "The file's name (.csv, .txt or .tsv).",
    sizeBytes: "The exact size; the presigned PUT is signed for it.",
    contentType: "The file's type as the browser reports it.",
  },
  UploadComplete: {
    channel: "As for the multipart upload.",
    probe: "As for the multipart upload.",
    keepDuplicate: "true keeps a second copy of a file already logged on this build.",
  },
};

/**
 * Response fields that reference another component and may be null: zod-to-openapi drops a description given on
 * such a field, so it is laid on here.
 */
export const RESPONSE_NOTES: Record<string, Record<string, string>> = {
  Design: { prediction: "The predicted frequency and tolerance bands; null when the model refuses the values." },
  DesignListItem: { prediction: "The predicted frequency and tolerance bands; null when the model refuses the values." },
  DesignDetail: { prediction: "The predicted frequency and tolerance bands; null when the model refuses the values." },
  BuildDetail: { prediction: "Prediction for the as-built values; null when the model refuses them." },
  BuildListItem: { latestRun: "The newest run; null before the first capture." },
  Run: {
    results: "The analysis result (what `analyze --json` prints); null until status is done.",
    drift: "Measured against predicted; null until done or without a prediction.",
    tweak: "The tweak this capture follows, if any.",
  },
};

/** Query parameters by name (the same meaning on every list). */
export const PARAM_NOTES: Record<string, string> = {
  cursor: "The `nextCursor` of the previous page; leave out for the first page.",
  limit: "Items per page, 1 to 200.",
  q: "Search text (case-insensitive).",
  verdict: "pass, fail, or none (runs with no verdict).",
  status: "Only items in this state.",
  from: "Only runs logged at or after this time (ISO 8601).",
  to: "Only runs logged before this time (ISO 8601).",
  topology: "Only designs of this topology.",
  kind: "Only builds of this kind.",
};

type JsonObject = Record<string, unknown>;

/**
 * Lays the notes onto a generated document (in place), keeping any description the schema already carries.
 * @returns notes whose component or field is missing from the document (stale notes), as "Component.field"
 */
export function applyNotes(doc: JsonObject): string[] {
  const stale: string[] = [];
  const schemas = ((doc.components as JsonObject | undefined)?.schemas ?? {}) as Record<string, JsonObject>;
  for (const [component, notes] of [...Object.entries(FIELD_NOTES), ...Object.entries(RESPONSE_NOTES)]) {
    const properties = schemas[component]?.properties as Record<string, JsonObject> | undefined;
    for (const [field, note] of Object.entries(notes)) {
      const property = properties?.[field];
      if (!property) stale.push(`${component}.${field}`);
      else property.description ??= note;
    }
  }
  for (const pathItem of Object.values((doc.paths ?? {}) as Record<string, Record<string, JsonObject>>)) {
    for (const operation of Object.values(pathItem)) {
      for (const parameter of (operation.parameters ?? []) as JsonObject[]) {
        const note = parameter.in === "query" ? PARAM_NOTES[parameter.name as string] : undefined;
        if (note) parameter.description ??= note;
      }
    }
  }
  return stale;
}
