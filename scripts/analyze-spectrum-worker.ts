/**
 * Worker thread of the `analyze` command: computes the windowed spectrum of the analysed channel
 * while the main thread fits the sine and the harmonics (the machine has a second core; the
 * spectrum is a fifth of the work). The samples arrive in shared memory; the spectrum goes back
 * on a message port, and a shared flag wakes the main thread.
 */
import { type MessagePort, parentPort } from "node:worker_threads";
import { windowedSpectrum } from "../lib/analysis";

interface Job {
  samples: SharedArrayBuffer;
  length: number;
  sampleRateHz: number;
  maxFftLength?: number;
  port: MessagePort;
  done: SharedArrayBuffer;
}

parentPort?.once("message", (job: Job) => {
  const flag = new Int32Array(job.done);
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
  try {
    const spectrum = windowedSpectrum(new Float64Array(job.samples, 0, job.length), job.sampleRateHz, { maxFftLength: job.maxFftLength });
    job.port.postMessage({ spectrum }, [spectrum.amplitudeVpk.buffer as ArrayBuffer]);
  } catch (error) {
    job.port.postMessage({ error: error instanceof Error ? error.message : String(error) });
  } finally {
    Atomics.store(flag, 0, 2);
    Atomics.notify(flag, 0);
  }
});
