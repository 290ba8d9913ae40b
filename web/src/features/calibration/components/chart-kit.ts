import { useEffect, useState, type RefObject } from 'react';

/** Width of a box, followed as it resizes (uPlot draws at a fixed pixel width). */
export function useWidth(ref: RefObject<HTMLDivElement | null>): number {
  const [w, setW] = useState(0);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const ro = new ResizeObserver(([e]) => setW(Math.floor(e.contentRect.width)));
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref]);
  return w;
}

/** Canvas cannot read CSS variables: resolve them once per theme (the argument is the cache key). */
export function readColours(_theme: string) {
  const css = getComputedStyle(document.documentElement);
  const v = (name: string) => css.getPropertyValue(name).trim() || '#888';
  return { ink: v('--fs-chart-line'), muted: v('--fs-ink-muted'), grid: v('--fs-chart-grid'), attention: v('--fs-a2') };
}

export const AXIS_FONT = '12px Barlow, system-ui';
export const LABEL_FONT = '600 12px Barlow, system-ui';
