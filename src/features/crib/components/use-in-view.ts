import { useEffect, useRef } from "react";

/**
 * Keeps the answer to a scan on screen: whenever `key` changes (a new answer), the element is scrolled
 * into view — on a phone the answer would otherwise land below the fold and the scan seem to do nothing.
 */
export function useInView<T extends HTMLElement>(key: unknown) {
  const ref = useRef<T>(null);
  useEffect(() => {
    if (key == null || key === false) return;
    const el = ref.current;
    if (!el) return;
    // An answer taller than the screen shows its start (the verdict and title), a shorter one as little scrolling as needed.
    el.scrollIntoView({ block: el.getBoundingClientRect().height > window.innerHeight ? "start" : "nearest" });
  }, [key]);
  return ref;
}
