import { useEffect, useRef, useState, type InputHTMLAttributes } from "react";

/** A text filter that tells the list only when typing pauses, so each keystroke is not a server query. */
export function DebouncedInput({ value, onValue, delay = 300, ...props }: Omit<InputHTMLAttributes<HTMLInputElement>, "value" | "onChange"> & { value: string; onValue: (v: string) => void; delay?: number }) {
  const [text, setText] = useState(value);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  // The address may change from outside (Clear filters, back button).
  useEffect(() => setText(value), [value]);
  useEffect(() => () => void (timer.current && clearTimeout(timer.current)), []);
  return (
    <input
      {...props}
      value={text}
      onChange={(e) => {
        const v = e.target.value;
        setText(v);
        if (timer.current) clearTimeout(timer.current);
        timer.current = setTimeout(() => onValue(v), delay);
      }}
    />
  );
}
