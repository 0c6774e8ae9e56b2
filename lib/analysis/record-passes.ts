import type { CaptureChannel } from "./csv-import";
import { frequencyUncertainty } from "./frequency-uncertainty";
import { fitHarmonics, fitHarmonicsOfChannels, residualVariance } from "./harmonic-fit";
import { reportHarmonics } from "./harmonic-report";
import { sinadDb } from "./metrics";
import { fitSine4, type SineFit } from "./sine-fit";
import { checkClipping, checkDrift, checkEnvelope, checkTone } from "./warnings";

/**
 * Everything that follows from the first fit and needs no spectrum: the harmonics taken out of the
 * record (written to `cleaned`), the second fit on what is left, the harmonic fit of both channels
 * at its frequency, and the figures and checks from those. A function so the rare restart of the
 * spectrum's safety net in analyze-capture.ts can run it again. `extremes` are the record's own,
 * already found by the statistics pass.
 */
export function passesFrom(
  y: Float64Array,
  sampleRateHz: number,
  first: SineFit,
  maxOrder: number,
  compare: CaptureChannel | undefined,
  cleaned: Float64Array,
  extremes: { minV: number; maxV: number },
) {
  const n = y.length;
  const { cleanedSums } = fitHarmonics(y, first.omegaRadPerSample, maxOrder, { cleanedOut: cleaned });
  // Second pass: harmonics leak into a single-sine fit and bias it; fitting the cleaned record removes that.
  // The harmonic fit summed the cleaned record as it wrote it, over the whole of it: the fit need not again.
  const fit = fitSine4(cleaned, sampleRateHz, first.frequencyHz, { spanSums: cleanedSums });
  // The compared channel shares the pass: same frequency, same columns.
  const [harmonicFit, compareFit] = fitHarmonicsOfChannels(compare ? [y, compare.samples] : [y], fit.omegaRadPerSample, maxOrder);

  const fundamentalVpk = harmonicFit.amplitudesVpk[0];
  const frequencyHz = fit.frequencyHz;
  const noiseVariance = residualVariance(harmonicFit);
  const { harmonics, thd } = reportHarmonics(harmonicFit, maxOrder, sampleRateHz, noiseVariance);
  const whiteNoiseHz = (sampleRateHz / (2 * Math.PI)) * Math.sqrt(Math.max(0, noiseVariance * fit.omegaVarianceFactor));
  const uncertainty = frequencyUncertainty(cleaned, sampleRateHz, frequencyHz, whiteNoiseHz);
  const signalRms = fundamentalVpk / Math.SQRT2;
  const noiseVrms = Math.sqrt(harmonicFit.noiseSumOfSquares / n);
  const nadRms = Math.sqrt(harmonicFit.noiseAndDistortionSumOfSquares / n);
  const sinad = sinadDb(signalRms, nadRms);
  const snr = sinadDb(signalRms, noiseVrms);
  const tone = checkTone(fundamentalVpk, n, harmonicFit.noiseAndDistortionSumOfSquares / Math.max(1, n - 3));

  const cycles = (frequencyHz * n) / sampleRateHz;
  const samplesPerCycle = sampleRateHz / frequencyHz;
  const clipping = checkClipping(y, samplesPerCycle, extremes);
  const envelope = checkEnvelope(cleaned, sampleRateHz, frequencyHz, noiseVrms);
  const drift = cycles >= 6 ? checkDrift(cleaned, sampleRateHz, frequencyHz) : undefined;
  return { fit, harmonicFit, compareFit, harmonics, thd, uncertainty, noiseVrms, sinad, snr, tone, cycles, samplesPerCycle, clipping, envelope, drift };
}
