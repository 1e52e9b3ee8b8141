import { useId, useRef, useState, type DragEvent } from "react";
import { IconUpload } from "@/components/icons";

/** Drop zone plus an ordinary file input (keyboard and screen-reader users use the input). */
export function FileDrop({ onFiles, disabled = false }: { onFiles: (files: File[]) => void; disabled?: boolean }) {
  const id = useId();
  const [over, setOver] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  function onDrop(e: DragEvent<HTMLDivElement>) {
    e.preventDefault();
    setOver(false);
    if (disabled) return;
    const files = [...e.dataTransfer.files];
    if (files.length) onFiles(files);
  }

  return (
    <div
      onDragOver={(e) => {
        e.preventDefault();
        if (!disabled) setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={onDrop}
      data-testid="file-drop"
      className={`flex flex-col items-center gap-3 rounded-[var(--radius-card)] border-2 border-dashed p-8 text-center transition-colors ${
        over ? "border-moss bg-moss-wash" : "border-line bg-paper"
      }`}
    >
      <IconUpload width="2.2em" height="2.2em" className="text-moss" />
      <p className="text-lg font-semibold">Drag this week's sensor files here</p>
      <p className="text-ink-soft">One file from each sensor (usually four). Files ending in .csv, or a BIDS set (.tsv and .json).</p>
      <label htmlFor={id} className="cursor-pointer rounded-lg border border-line bg-sand px-4 py-2 font-semibold hover:bg-sand-deep focus-within:outline-3 focus-within:outline-focus">
        Or choose files
        <input
          id={id}
          ref={input}
          type="file"
          multiple
          accept=".csv,.tsv,.json,text/csv,text/tab-separated-values,application/json"
          disabled={disabled}
          className="sr-only"
          onChange={(e) => {
            const files = [...(e.target.files ?? [])];
            if (files.length) onFiles(files);
            if (input.current) input.current.value = "";
          }}
        />
      </label>
    </div>
  );
}
