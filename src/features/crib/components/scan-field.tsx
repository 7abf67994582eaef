import { forwardRef, useImperativeHandle, useRef, useState } from "react";
import { TextField } from "../../../components/ui/field";

export interface ScanFieldHandle {
  focus(): void;
}

/**
 * An asset-tag field for a keyboard-wedge scanner: the scanner types the tag
 * and Enter; the field hands the tag over, clears itself and stays ready for
 * the next scan. Typing by hand works the same way.
 */
export const ScanField = forwardRef<ScanFieldHandle, { label: string; hint?: string; onScan: (tag: string) => void; disabled?: boolean; autoFocus?: boolean }>(function ScanField(
  { label, hint, onScan, disabled, autoFocus = true },
  ref,
) {
  const input = useRef<HTMLInputElement>(null);
  const [value, setValue] = useState("");
  useImperativeHandle(ref, () => ({ focus: () => input.current?.focus() }));
  return (
    <TextField
      ref={input}
      label={label}
      hint={hint}
      value={value}
      disabled={disabled}
      autoFocus={autoFocus}
      autoComplete="off"
      autoCapitalize="characters"
      spellCheck={false}
      className="font-mono text-xl tracking-wide"
      onChange={(e) => setValue(e.target.value)}
      onKeyDown={(e) => {
        if (e.key !== "Enter") return;
        e.preventDefault();
        const tag = value.trim();
        if (!tag) return;
        setValue("");
        onScan(tag);
      }}
    />
  );
});
