/** The shapes the upload form exchanges with the server actions it is given (see /work/notes/ui-needs.md). */

export interface UploadRequest {
  filename: string;
  sizeBytes: number;
  contentType: string;
}

export type UploadSlotResult =
  | { ok: true; slotId: string; uploadUrl: string; headers?: Record<string, string> }
  | { ok: false; message: string };

export interface RunRegistration {
  /** The column name chosen (without its unit), or null to let the analysis pick the first voltage column. */
  channel: string | null;
  /** Probe attenuation factor (1, 10, 100…), named as in lib/validations/run.ts. */
  probe: number;
  supplyV: number | null;
  temperatureC: number | null;
  note: string;
  tweakId: string | null;
  /** Register even though the same file is already logged on this build. */
  keepDuplicate: boolean;
}

export interface DuplicateRun {
  runId: string;
  createdAt: string | Date;
  originalFilename: string;
}

export type RegisterResult =
  | { ok: true; runId: string }
  | { ok: false; duplicateOf: DuplicateRun; message?: string }
  | { ok: false; message: string; errors?: Record<string, string[]>; duplicateOf?: undefined };

/** A tweak the run may follow, newest first. */
export interface TweakChoice {
  id: string;
  label: string;
}
