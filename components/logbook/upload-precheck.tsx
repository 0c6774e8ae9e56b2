"use client";

import { useState } from "react";
import { checkCaptureStart, SNIFF_BYTES, type SniffedHeader } from "@/lib/capture-sniff/sniff-header";

/** What the form knows about the chosen file's start: nothing yet, reading, readable (with its header), or refused. */
export type CapturePrecheck =
  | { state: "none" }
  | { state: "reading" }
  | { state: "ok"; header: SniffedHeader }
  | { state: "problem"; message: string };

/**
 * The browser's pre-check of a chosen capture: reads its first 64 kB and runs the same rules as the server
 * (lib/capture-sniff, which runs the importer), so a file the server would refuse is refused here, before any upload.
 * @returns the current result and `check(file)`, which resolves to the header when the file is readable
 */
export function useCapturePrecheck(): { precheck: CapturePrecheck; check: (file: File | null) => Promise<SniffedHeader | null> } {
  const [precheck, setPrecheck] = useState<CapturePrecheck>({ state: "none" });
  async function check(file: File | null): Promise<SniffedHeader | null> {
    if (!file) {
      setPrecheck({ state: "none" });
      return null;
    }
    setPrecheck({ state: "reading" });
    try {
      // Only the start of the file is read here; the upload itself streams the File from disk.
      const bytes = new Uint8Array(await file.slice(0, SNIFF_BYTES).arrayBuffer());
      const result = checkCaptureStart(bytes, file.size <= SNIFF_BYTES);
      setPrecheck(result.ok ? { state: "ok", header: result.header } : { state: "problem", message: result.message });
      return result.ok ? result.header : null;
    } catch {
      setPrecheck({ state: "problem", message: "The file could not be read. Choose it again." });
      return null;
    }
  }
  return { precheck, check };
}

/** The pre-check's result under the file picker: a refusal says why and what to do; a readable file its layout. */
export function PrecheckSummary({ precheck, id }: { precheck: CapturePrecheck; id?: string }) {
  if (precheck.state === "none") return null;
  if (precheck.state === "reading") {
    return (
      <p id={id} role="status" className="text-xs text-ink-soft">
        Reading the header…
      </p>
    );
  }
  if (precheck.state === "problem") {
    return (
      <p id={id} role="alert" className="rounded-md border border-verdict-fail/40 bg-verdict-failBg px-3 py-2 text-sm text-ink">
        <span aria-hidden="true" className="mr-1 font-semibold text-verdict-fail">✕</span>
        {precheck.message} Tankbook cannot analyse this file, so it is not uploaded; export the capture from the scope
        as CSV and choose that file.
      </p>
    );
  }
  const h = precheck.header;
  const delimiterName = h.delimiter === "," ? "comma" : h.delimiter === ";" ? "semicolon" : "tab";
  const preambleCount = Object.keys(h.preamble).length;
  const clock = h.timeColumn
    ? `, time in “${h.timeColumn.header}”`
    : h.preambleClock
      ? `, no time column: ${h.preambleClock.sampleRate} from the preamble line “${h.preambleClock.key}”`
      : "";
  return (
    <p id={id} role="status" className="text-xs text-ink-soft">
      <span aria-hidden="true" className="mr-1 text-verdict-pass">✓</span>
      Header on line {h.headerLine}, {h.columns.length} columns ({delimiterName}-separated){clock}
      {preambleCount > 0 ? `, ${preambleCount} preamble line${preambleCount === 1 ? "" : "s"}` : ""}.
    </p>
  );
}
