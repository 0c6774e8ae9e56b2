/** A build's story across its runs: the implied-capacitance trend, the timeline chart series, run comparison. Pure. */
export * from "./implied-capacitance";
export * from "./timeline";
export * from "./run-comparison";
export * from "./spectrum-overlay";
