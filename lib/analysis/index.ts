/**
 * Tankbook's capture analysis engine: pure TypeScript, no I/O.
 *
 * Typical use (a worker or a command reading a file as a stream):
 *
 * ```ts
 * import { CaptureImporter, analyzeCapture, CaptureImportError } from "@/lib/analysis";
 * const importer = new CaptureImporter({ sizeHintBytes });
 * for await (const chunk of stream) importer.push(chunk);
 * const { result, plot } = analyzeCapture(importer.finish(), { harmonics: 10 });
 * ```
 *
 * Bad input raises {@link CaptureImportError} with a one-line message (and `line` for a bad row);
 * anything else thrown is a bug.
 *
 * @packageDocumentation
 */

export { analysisChannels, analyzeCapture, analyzeSamples } from "./analyze-capture";
export type { AnalyzeOptions } from "./analyze-capture";
export type {
  AnalysisMethod,
  AnalysisResult,
  AnalysisTimings,
  CaptureAnalysis,
  FrequencyUncertainty,
  Harmonic,
  HarmonicStatus,
  InRecordDrift,
  Spur,
  SpurKind,
  ThdSummary,
  TwoChannelResult,
} from "./analysis-result";
export { formatSampleRate } from "./format-rate";
export { CaptureImporter, importCapture, MAX_ABS_VOLTS, MIN_SAMPLES } from "./csv-import";
export { parseRowStretch } from "./parse/row-stretch";
export type { RowStretchOptions } from "./parse/row-stretch";
export type { ParsedRows, RowLayout } from "./row-parser";
export type { Capture, CaptureChannel, CaptureImportOptions, TimeSource } from "./csv-import";
export type { CaptureColumn, ColumnKind } from "./columns";
export { CaptureImportError } from "./errors";
export { applyProbeAttenuation } from "./probe";
export type { HarmonicMarker, PlotData, SpectrumPlot, WaveformEnvelope } from "./plot";
export { prepareWindowedSpectrum, windowedSpectrum } from "./spectrum";
export type { Spectrum, SpectrumOptions } from "./spectrum";
export { gainPhaseAtFundamental } from "./two-channel";
export type { GainPhase } from "./two-channel";
export type { AnalysisWarning, WarningCode } from "./warnings";
export { ENGINE_VERSION } from "./version";
