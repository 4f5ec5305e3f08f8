import { type RefCallback, useCallback, useState } from 'react';

/**
 * The rendered width of an element in CSS pixels, kept current with a ResizeObserver, so an SVG
 * can be drawn at its real size (text stays at its font size instead of scaling with a viewBox).
 */
export function useElementWidth<T extends Element>(fallback = 720): [RefCallback<T>, number] {
  const [width, setWidth] = useState(fallback);
  const ref = useCallback<RefCallback<T>>((element) => {
    if (!element) return;
    const measure = () => {
      const next = Math.round(element.getBoundingClientRect().width);
      if (next > 0) setWidth(next);
    };
    measure();
    if (typeof ResizeObserver === 'undefined') return;
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, []);
  return [ref, width];
}
