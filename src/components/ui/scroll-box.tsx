import { useEffect, useLayoutEffect, useRef, useState, type ReactNode } from "react";
import { flushSync } from "react-dom";
import { cx } from "./cx";

/**
 * A box that scrolls sideways when its content (a wide table) is wider than the screen (or, with
 * className "max-h-… overflow-auto", down when it is taller than the box). While it
 * scrolls it can be reached with Tab and scrolled with the arrow keys (WCAG 2.1.1), and is named as a
 * region; when everything fits it adds no tab stop.
 *
 * The size is measured after every render, before the browser paints (so rows that arrive and make the
 * table wider bring the tab stop in the same commit, never a moment later), and again whenever the box or
 * its content is resized (a turned phone, a narrower window, a web font arriving and widening the text). The
 * observer's change is committed at once (flushSync): the observer runs after layout and before paint, so the
 * tab stop is in place in the frame where the table first overflows, not one task later.
 */
export function ScrollBox({ label, className, children }: { label: string; className?: string; children: ReactNode }) {
  const ref = useRef<HTMLDivElement>(null);
  const [scrolls, setScrolls] = useState(false);
  const measure = () => {
    const el = ref.current;
    if (el) setScrolls(el.scrollWidth > el.clientWidth + 1 || el.scrollHeight > el.clientHeight + 1);
  };
  useLayoutEffect(measure);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const observer = new ResizeObserver(() => flushSync(measure));
    observer.observe(el);
    if (el.firstElementChild) observer.observe(el.firstElementChild);
    return () => observer.disconnect();
  }, []);
  return (
    <div
      ref={ref}
      className={cx(!className?.includes("overflow-auto") && "overflow-x-auto", className)}
      {...(scrolls ? { tabIndex: 0, role: "region", "aria-label": `${label} (scrolls)` } : {})}
    >
      {children}
    </div>
  );
}
