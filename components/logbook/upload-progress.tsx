import { ProgressBar } from "@/components/ui/progress-bar";
import { formatBytes, formatDuration, formatRate } from "@/lib/format/bytes";
import type { UploadProgress } from "./put-with-progress";

/** The upload's progress: share, bytes sent of the total, speed and time left. */
export function UploadProgressPanel({ progress }: { progress: UploadProgress }) {
  const fraction = progress.totalBytes > 0 ? progress.loadedBytes / progress.totalBytes : 0;
  return (
    <div className="space-y-2 rounded-lg border border-rule bg-paper px-3 py-3" aria-live="polite">
      <ProgressBar value={fraction} label="Upload progress" />
      <div className="num flex flex-wrap items-center justify-between gap-x-4 gap-y-1 font-mono text-xs text-ink-soft">
        <span>
          <strong className="text-ink">{(fraction * 100).toFixed(1)} %</strong> · {formatBytes(progress.loadedBytes)} of{" "}
          {formatBytes(progress.totalBytes)}
        </span>
        <span>
          {progress.bytesPerSecond > 0 ? formatRate(progress.bytesPerSecond) : "measuring speed…"}
          {progress.secondsLeft !== null ? ` · ${formatDuration(progress.secondsLeft)} left` : ""}
        </span>
      </div>
    </div>
  );
}
