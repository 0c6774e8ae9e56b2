"use client";

import { useState, type RefObject } from "react";
import { describedBy } from "@/components/ui/field";
import { formatBytes } from "@/lib/format/bytes";
import { cn } from "@/lib/utils";

export interface UploadFilePickerProps {
  /** The input's id; its hint and error carry the `-hint` and `-error` suffixes. */
  id: string;
  inputRef: RefObject<HTMLInputElement | null>;
  file: File | null;
  disabled: boolean;
  errors?: string[];
  maxBytes?: number;
  onChoose: (file: File | null) => void;
}

/** The drop zone and file button of the capture upload, with the format hint and the file's errors. */
export function UploadFilePicker({ id, inputRef, file, disabled, errors, maxBytes, onChoose }: UploadFilePickerProps) {
  const [dragging, setDragging] = useState(false);
  return (
    <div
      onDragOver={(event) => {
        event.preventDefault();
        if (!disabled) setDragging(true);
      }}
      onDragLeave={() => setDragging(false)}
      onDrop={(event) => {
        event.preventDefault();
        setDragging(false);
        const dropped = event.dataTransfer.files?.[0];
        if (!disabled && dropped) onChoose(dropped);
      }}
      className={cn(
        "rounded-lg border-2 border-dashed px-4 py-5 text-center transition-colors focus-within:border-copper focus-within:ring-2 focus-within:ring-copper/40",
        dragging ? "border-copper bg-copper-light/60" : "border-rule-strong bg-paper",
        errors && "border-verdict-fail",
      )}
    >
      <input
        ref={inputRef}
        id={id}
        type="file"
        accept=".csv,.txt,.tsv,text/csv,text/plain"
        className="sr-only"
        disabled={disabled}
        aria-describedby={describedBy(id)}
        aria-invalid={errors ? true : undefined}
        onChange={(event) => onChoose(event.target.files?.[0] ?? null)}
      />
      {file ? (
        <div className="space-y-1">
          <p className="break-all font-medium text-ink">{file.name}</p>
          <p className="num font-mono text-xs text-ink-soft">{formatBytes(file.size)}</p>
        </div>
      ) : (
        <p className="text-sm text-ink-soft">
          <span aria-hidden="true" className="mr-1">⇪</span>
          Drop a capture CSV here, or
        </p>
      )}
      <label
        htmlFor={id}
        className={cn(
          "mt-3 inline-flex h-9 cursor-pointer items-center rounded-md border border-rule-strong bg-paper-raised px-3.5 text-sm font-medium text-ink hover:bg-paper-sunk",
          disabled && "pointer-events-none opacity-50",
        )}
      >
        {file ? "Choose another file" : "Choose a file"}
      </label>
      <div id={`${id}-hint`} className="mt-2 text-xs text-ink-faint">
        CSV from the scope: an optional preamble, a header row naming the columns (e.g. Time (s), Out (V)), then the
        samples. Large files are fine{maxBytes ? ` (up to ${formatBytes(maxBytes)})` : ""}.
      </div>
      <div id={`${id}-error`} aria-live="polite">
        {errors?.map((e) => (
          <p key={e} className="mt-1 text-xs font-medium text-verdict-fail">
            {e}
          </p>
        ))}
      </div>
    </div>
  );
}
