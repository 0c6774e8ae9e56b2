/**
 * PUTs a File to a presigned URL with XMLHttpRequest, which (unlike fetch) reports upload progress. The browser
 * streams the File from disk, so a capture of hundreds of MB never sits in page memory.
 */

export interface UploadProgress {
  loadedBytes: number;
  totalBytes: number;
  /** Smoothed over the last few seconds, bytes per second; 0 until there is enough to tell. */
  bytesPerSecond: number;
  /** Seconds left at the current rate, or null when unknown. */
  secondsLeft: number | null;
}

export interface UploadHandle {
  /** Resolves when storage answered 2xx; rejects with an Error whose message says what happened. */
  done: Promise<void>;
  /** Stops the transfer; `done` then rejects with an {@link UploadCancelledError}. */
  cancel: () => void;
}

export class UploadCancelledError extends Error {
  constructor() {
    super("Upload cancelled.");
    this.name = "UploadCancelledError";
  }
}

/** How far back the rate looks: long enough to smooth bursts, short enough to follow a change of link. */
const RATE_WINDOW_MS = 3_000;

/**
 * Starts the PUT.
 *
 * @param url - presigned PUT URL from the server.
 * @param file - the File (or Blob) chosen by the user.
 * @param headers - headers the presigned URL was signed with (e.g. content-type).
 * @param onProgress - called on every progress event.
 */
export function putWithProgress(
  url: string,
  file: Blob,
  headers: Record<string, string>,
  onProgress: (progress: UploadProgress) => void,
): UploadHandle {
  const xhr = new XMLHttpRequest();
  const samples: Array<{ t: number; loaded: number }> = [];
  let cancelled = false;
  // Some browsers deliver a queued progress event after abort or load; nothing is reported once settled.
  let settled = false;

  const done = new Promise<void>((resolve, reject) => {
    xhr.open("PUT", url);
    for (const [name, value] of Object.entries(headers)) xhr.setRequestHeader(name, value);
    xhr.upload.onprogress = (event) => {
      if (settled) return;
      const now = performance.now();
      samples.push({ t: now, loaded: event.loaded });
      while (samples.length > 2 && now - samples[0].t > RATE_WINDOW_MS) samples.shift();
      const first = samples[0];
      const elapsedS = (now - first.t) / 1000;
      const bytesPerSecond = elapsedS > 0.25 ? (event.loaded - first.loaded) / elapsedS : 0;
      const total = event.lengthComputable ? event.total : file.size;
      onProgress({
        loadedBytes: event.loaded,
        totalBytes: total,
        bytesPerSecond,
        secondsLeft: bytesPerSecond > 0 ? (total - event.loaded) / bytesPerSecond : null,
      });
    };
    xhr.onload = () => {
      settled = true;
      if (xhr.status >= 200 && xhr.status < 300) resolve();
      else reject(new Error(`Storage refused the file (HTTP ${xhr.status}). Try again; if it keeps failing, tell your admin.`));
    };
    xhr.onerror = () => {
      settled = true;
      reject(new Error("The connection to storage failed during the upload. Check the network and try again."));
    };
    xhr.onabort = () => {
      settled = true;
      reject(new UploadCancelledError());
    };
    xhr.ontimeout = () => {
      settled = true;
      reject(new Error("The upload timed out. Try again."));
    };
    xhr.send(file);
  });

  return {
    done,
    cancel: () => {
      if (!cancelled) {
        cancelled = true;
        settled = true;
        xhr.abort();
      }
    },
  };
}
