"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useId, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, describedBy } from "@/components/ui/field";
import { formatBytes } from "@/lib/format/bytes";
import { formatDateTime } from "@/lib/format/dates";
import { putWithProgress, UploadCancelledError, type UploadHandle, type UploadProgress } from "./put-with-progress";
import { UploadFilePicker } from "./upload-file-picker";
import { UploadMeasurementFields, type MeasurementValues } from "./upload-measurement-fields";
import { PrecheckSummary, useCapturePrecheck } from "./upload-precheck";
import { UploadProgressPanel } from "./upload-progress";
import type { DuplicateRun, RegisterResult, RunRegistration, TweakChoice, UploadRequest, UploadSlotResult } from "./upload-types";

export interface UploadFormProps {
  buildId: string;
  tweaks: TweakChoice[];
  /** The tweak to preselect: the latest one logged since the last run, if any. */
  defaultTweakId?: string | null;
  requestUpload: (buildId: string, request: UploadRequest) => Promise<UploadSlotResult>;
  registerRun: (slotId: string, registration: RunRegistration) => Promise<RegisterResult>;
  /** Lets the server drop the slot and any bytes that reached storage after the user cancels. */
  cancelUpload?: (slotId: string) => Promise<unknown>;
  /** Largest file the server accepts, bytes (shown and checked before uploading). */
  maxBytes?: number;
}

type Phase =
  | { kind: "idle" }
  | { kind: "uploading"; progress: UploadProgress }
  | { kind: "registering" }
  | { kind: "duplicate"; slotId: string; registration: RunRegistration; duplicate: DuplicateRun }
  | { kind: "done"; runId: string };

function numberOrNull(text: string): number | null | "bad" {
  const t = text.trim().replace(",", ".");
  if (t === "") return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : "bad";
}

/**
 * The capture upload: pick or drop a CSV, which is checked in the browser by the server's own rules (a file
 * Tankbook cannot read is refused before uploading); choose the channel from the columns found in its first 64 kB,
 * say how it was measured, then the file goes straight to storage with real progress, and the run is registered.
 */
export function UploadForm({ buildId, tweaks, defaultTweakId, requestUpload, registerRun, cancelUpload, maxBytes }: UploadFormProps) {
  const router = useRouter();
  const ids = useId();
  const id = (name: string) => `${ids}-${name}`;
  const inputRef = useRef<HTMLInputElement>(null);
  const uploadRef = useRef<UploadHandle | null>(null);
  const [file, setFile] = useState<File | null>(null);
  const { precheck, check } = useCapturePrecheck();
  const [phase, setPhase] = useState<Phase>({ kind: "idle" });
  const [message, setMessage] = useState<string | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});

  const [channel, setChannel] = useState("");
  const [measured, setMeasured] = useState<MeasurementValues>({ probe: "1", supply: "", temperature: "", tweakId: defaultTweakId ?? "", note: "" });

  const busy = phase.kind === "uploading" || phase.kind === "registering";

  // A tweak logged while this form is open becomes the one the next capture follows.
  useEffect(() => {
    setMeasured((m) => ({ ...m, tweakId: defaultTweakId ?? "" }));
  }, [defaultTweakId]);

  async function choose(next: File | null) {
    setMessage(null);
    setErrors({});
    setPhase({ kind: "idle" });
    setFile(next);
    setChannel("");
    const header = await check(next);
    if (header) setChannel(header.channels[0]?.name ?? "");
  }

  function readRegistration(): RunRegistration | null {
    const problems: Record<string, string[]> = {};
    const { probe, supply, temperature, note, tweakId } = measured;
    const probeValue = numberOrNull(probe);
    if (probeValue === null || probeValue === "bad" || probeValue < 1) {
      problems.probe = ["Give the probe attenuation as a number of 1 or more (1 if the scope already scaled for the probe)."];
    }
    const supplyValue = numberOrNull(supply);
    if (supplyValue === "bad") problems.supplyV = ["Give the supply voltage as a number of volts, or leave it empty."];
    const temperatureValue = numberOrNull(temperature);
    if (temperatureValue === "bad") problems.temperatureC = ["Give the temperature as a number of °C, or leave it empty."];
    setErrors(problems);
    if (Object.keys(problems).length > 0) return null;
    return {
      channel: channel.trim() === "" ? null : channel.trim(),
      probe: probeValue as number,
      supplyV: supplyValue as number | null,
      temperatureC: temperatureValue as number | null,
      note: note.trim(),
      tweakId: tweakId === "" ? null : tweakId,
      keepDuplicate: false,
    };
  }

  async function register(slotId: string, registration: RunRegistration) {
    setPhase({ kind: "registering" });
    let result: RegisterResult;
    try {
      result = await registerRun(slotId, registration);
    } catch {
      setPhase({ kind: "idle" });
      setMessage("The file is stored, but registering the run failed on the server. Try the upload again.");
      return;
    }
    if (result.ok) {
      setPhase({ kind: "done", runId: result.runId });
      router.push(`/runs/${result.runId}`);
      return;
    }
    if (result.duplicateOf) {
      setPhase({ kind: "duplicate", slotId, registration, duplicate: result.duplicateOf });
      return;
    }
    setPhase({ kind: "idle" });
    setErrors(result.errors ?? {});
    setMessage(result.message);
  }

  async function submit() {
    setMessage(null);
    if (!file) {
      setErrors({ file: ["Choose a capture CSV first."] });
      return;
    }
    if (precheck.state === "reading") return;
    if (precheck.state === "problem") {
      setErrors({ file: ["Choose a capture Tankbook can read: this file is refused (see why below)."] });
      return;
    }
    if (maxBytes !== undefined && file.size > maxBytes) {
      setErrors({ file: [`This file is ${formatBytes(file.size)}; the largest capture accepted is ${formatBytes(maxBytes)}.`] });
      return;
    }
    const registration = readRegistration();
    if (!registration) return;

    setPhase({ kind: "uploading", progress: { loadedBytes: 0, totalBytes: file.size, bytesPerSecond: 0, secondsLeft: null } });
    let slot: UploadSlotResult;
    try {
      slot = await requestUpload(buildId, {
        filename: file.name,
        sizeBytes: file.size,
        contentType: file.type || "text/csv",
      });
    } catch {
      slot = { ok: false, message: "The server could not prepare the upload. Try again." };
    }
    if (!slot.ok) {
      setPhase({ kind: "idle" });
      setMessage(slot.message);
      return;
    }

    const handle = putWithProgress(slot.uploadUrl, file, slot.headers ?? {}, (progress) => {
      if (uploadRef.current === handle) setPhase({ kind: "uploading", progress });
    });
    uploadRef.current = handle;
    try {
      await handle.done;
    } catch (err) {
      setPhase({ kind: "idle" });
      const cancelled = err instanceof UploadCancelledError;
      setMessage(cancelled ? "Upload cancelled. Nothing was logged." : (err as Error).message);
      if (cancelUpload) void cancelUpload(slot.slotId).catch(() => undefined);
      return;
    } finally {
      uploadRef.current = null;
    }
    await register(slot.slotId, registration);
  }

  const progress = phase.kind === "uploading" ? phase.progress : null;

  return (
    <form
      className="space-y-4"
      aria-label="Upload a capture"
      onSubmit={(event) => {
        event.preventDefault();
        if (!busy) void submit();
      }}
    >
      <FormMessage message={message} />

      <UploadFilePicker
        id={id("file")}
        inputRef={inputRef}
        file={file}
        disabled={busy}
        errors={errors.file}
        maxBytes={maxBytes}
        onChoose={(next) => void choose(next)}
      />

      <PrecheckSummary precheck={precheck} id={id("precheck")} />

      <div className="grid gap-4 sm:grid-cols-2">
        {precheck.state === "ok" ? (
          <Field id={id("channel")} label="Channel to analyse" hint="The voltage columns found in the file's header.">
            <Select
              id={id("channel")}
              value={channel}
              onChange={(e) => setChannel(e.target.value)}
              disabled={busy}
              aria-describedby={describedBy(id("channel"))}
            >
              {precheck.header.channels.map((c) => (
                <option key={c.index} value={c.name}>
                  {c.header}
                </option>
              ))}
            </Select>
          </Field>
        ) : (
          <Field
            id={id("channel")}
            label="Channel to analyse"
            hint="Column name as in the header; leave empty to analyse the first voltage column."
            errors={errors.channel}
          >
            <Input
              id={id("channel")}
              value={channel}
              onChange={(e) => setChannel(e.target.value)}
              disabled={busy}
              placeholder="e.g. Out"
              aria-describedby={describedBy(id("channel"))}
            />
          </Field>
        )}
        <UploadMeasurementFields id={id} values={measured} onChange={(name, value) => setMeasured((m) => ({ ...m, [name]: value }))} tweaks={tweaks} errors={errors} disabled={busy} />
      </div>

      {phase.kind === "uploading" && progress ? <UploadProgressPanel progress={progress} /> : null}

      {phase.kind === "registering" ? (
        <p role="status" className="text-sm text-ink-soft">
          Stored. Registering the run and queueing its analysis…
        </p>
      ) : null}

      {phase.kind === "duplicate" ? (
        <div role="alert" className="space-y-3 rounded-lg border border-verdict-warn/50 bg-verdict-warnBg px-3 py-3 text-sm">
          <p className="text-ink">
            <span aria-hidden="true" className="mr-1 font-semibold text-verdict-warn">⧉</span>
            This exact file is already logged on this build: <strong>{phase.duplicate.originalFilename}</strong>, uploaded{" "}
            {formatDateTime(phase.duplicate.createdAt)}.
          </p>
          <div className="flex flex-wrap gap-2">
            <Link
              href={`/runs/${phase.duplicate.runId}`}
              className="inline-flex h-9 items-center rounded-md border border-copper bg-copper px-3.5 text-sm font-medium text-white hover:bg-copper-dark"
            >
              Open the existing run
            </Link>
            <Button
              variant="secondary"
              onClick={() => void register(phase.slotId, { ...phase.registration, keepDuplicate: true })}
            >
              Keep both
            </Button>
          </div>
        </div>
      ) : null}

      {phase.kind === "done" ? (
        <p role="status" className="text-sm text-verdict-pass">
          Run registered. Opening it…
        </p>
      ) : null}

      <div className="flex flex-wrap items-center gap-2">
        {phase.kind === "uploading" ? (
          // Distinct keys: reusing one <button> would turn it into the submit button while this click is still
          // being handled (abort settles synchronously), and the browser would then submit the form again.
          <Button
            key="cancel"
            variant="danger"
            onClick={(event) => {
              event.preventDefault();
              const handle = uploadRef.current;
              uploadRef.current = null;
              handle?.cancel();
            }}
          >
            Cancel upload
          </Button>
        ) : (
          <Button
            key="submit"
            type="submit"
            disabled={busy || !file || precheck.state !== "ok" || phase.kind === "duplicate" || phase.kind === "done"}
            aria-describedby={precheck.state === "problem" ? id("precheck") : undefined}
          >
            Upload and analyse
          </Button>
        )}
        {file && !busy && phase.kind !== "done" ? (
          <Button
            variant="ghost"
            onClick={() => {
              if (inputRef.current) inputRef.current.value = "";
              void choose(null);
            }}
          >
            Clear
          </Button>
        ) : null}
      </div>
    </form>
  );
}
