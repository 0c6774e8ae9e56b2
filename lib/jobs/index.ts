export { ANALYSIS_QUEUE, enqueueAnalysis, senderBoss, stopSender, type AnalysisJobData } from "./queue";
export { startAnalysisWorker, sweepExpiredUploads, sweepUnfinishedRuns, type AnalysisWorker, type WorkerOptions } from "./worker";
export { processRun, derivedColumns, type JobOutcome } from "./process-run";
export { jobSettings, type JobSettings } from "./config";
