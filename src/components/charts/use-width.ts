import { useEffect, useRef, useState } from 'react';

/** The element's width, kept current with a ResizeObserver (charts draw to it). */
export function useWidth<T extends HTMLElement>(fallback = 640) {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(fallback);
  useEffect(() => {
    // The parent's content box sets the width: it does not grow with the chart drawn inside.
    const el = ref.current?.parentElement;
    if (!el) return;
    const measure = () => {
      const cs = getComputedStyle(el);
      const inner = el.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight);
      setWidth(Math.max(280, Math.floor(inner || fallback)));
    };
    measure();
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, [fallback]);
  return { ref, width };
}
