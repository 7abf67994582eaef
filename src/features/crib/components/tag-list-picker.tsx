import type { Dispatch, SetStateAction } from "react";
import { ScanField } from "./scan-field";

/** Builds a list of tools by scanning or typing each tag (kept upper-case, each once), with a remove button per tag. */
export function TagListPicker({ tags, setTags, listLabel, autoFocus }: { tags: string[]; setTags: Dispatch<SetStateAction<string[]>>; listLabel: string; autoFocus?: boolean }) {
  return (
    <>
      <ScanField
        label="Add a tool"
        hint="Scan or type each tag, then Enter."
        autoFocus={autoFocus}
        onScan={(t) => setTags((x) => (x.some((y) => y.toUpperCase() === t.toUpperCase()) ? x : [...x, t.toUpperCase()]))}
      />
      <ul className="mt-2 flex flex-wrap gap-2" aria-label={listLabel}>
        {tags.map((t) => (
          <li key={t} className="flex items-center gap-1 rounded-full border border-paper-line bg-paper-sunk px-3 py-1 font-mono text-sm">
            {t}
            <button type="button" aria-label={`Remove ${t}`} className="ml-1 font-bold" onClick={() => setTags((x) => x.filter((y) => y !== t))}>
              ×
            </button>
          </li>
        ))}
      </ul>
    </>
  );
}
