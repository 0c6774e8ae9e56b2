import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/field";
import { formatDateTime } from "@/lib/format/dates";
import type { ComparedBuild } from "@/lib/layouts/build-comparison";

export interface CompareRunPickerProps {
  builds: ComparedBuild[];
}

/**
 * Which run of each build is compared: a plain GET form (works without script and from the keyboard), one select
 * per build whose first option is the default, the newest run that is not withdrawn. Withdrawn runs can be chosen
 * on purpose and say so.
 */
export function CompareRunPicker({ builds }: CompareRunPickerProps) {
  return (
    <form method="get" action="/builds/compare" className="rounded-lg border border-rule bg-paper-raised px-4 py-3" aria-labelledby="compare-runs-title">
      <h2 id="compare-runs-title" className="text-sm font-semibold text-ink">
        Runs compared
      </h2>
      <p className="mt-0.5 text-xs text-ink-soft">By default each build&apos;s newest analysed run that is not withdrawn; choose another to compare it instead.</p>
      <input type="hidden" name="ids" value={builds.map((b) => b.build.id).join(",")} />
      <div className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {builds.map((b) => {
          const id = `compare-run-${b.build.id}`;
          return (
            <div key={b.build.id} className="min-w-0 space-y-1">
              <label htmlFor={id} className="block truncate text-sm font-medium text-ink">
                {b.build.label} <span className="font-normal text-ink-soft">· {b.constructionName}</span>
              </label>
              <Select id={id} name="runs" defaultValue={b.runChosen && b.latestRun ? b.latestRun.id : ""} disabled={b.runChoices.length === 0}>
                <option value="">{b.runChoices.length === 0 ? "no analysed run yet" : "Newest not withdrawn (default)"}</option>
                {b.runChoices.map((r) => (
                  <option key={r.id} value={r.id}>
                    {formatDateTime(r.createdAt)} · {r.originalFilename}
                    {r.withdrawn ? " (withdrawn)" : ""}
                  </option>
                ))}
              </Select>
            </div>
          );
        })}
      </div>
      <Button type="submit" size="sm" variant="secondary" className="mt-3">
        Compare these runs
      </Button>
    </form>
  );
}
