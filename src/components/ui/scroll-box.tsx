import { useEffect, useRef, useState, type ReactNode } from "react";
import { cx } from "./cx";

/**
 * A box that scrolls sideways when its content (a wide table) is wider than the screen (or, with
 * className "max-h-… overflow-auto", down when it is taller than the box). While it
 * scrolls it can be reached with Tab and scrolled with the arrow keys (WCAG 2.1.1), and is named as a
 * region; when everything fits it adds no tab stop.
 */
export function ScrollBox({ label, className, children }: { label: string; className?: string; children: ReactNode }) {
  const ref = useRef<HTMLDivElement>(null);
  const [scrolls, setScrolls] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const measure = () => setScrolls(el.scrollWidth > el.clientWidth + 1 || el.scrollHeight > el.clientHeight + 1);
    measure();
    const observer = new ResizeObserver(measure);
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
