import { useLayoutEffect, useRef, useState } from "react";

// useLayoutEffect warns when rendered on the server; there the fallback width is used anyway.
const useBrowserLayoutEffect = typeof window === "undefined" ? () => {} : useLayoutEffect;

/**
 * The rendered width of an element in CSS pixels, kept up to date as its panel resizes. A chart
 * drawn with its viewBox at this width has one user unit per pixel, so its 12 px text stays 12 px
 * at any panel size. Before the page's scripts run (and on the server) it is `fallback`.
 */
export function useMeasuredWidth<T extends HTMLElement>(fallback: number): [React.RefObject<T | null>, number, boolean] {
  const ref = useRef<T | null>(null);
  const [width, setWidth] = useState<number | null>(null);
  useBrowserLayoutEffect(() => {
    const element = ref.current;
    if (!element) return;
    const measure = () => {
      const measured = Math.floor(element.getBoundingClientRect().width);
      if (measured > 0) setWidth(measured);
    };
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, []);
  return [ref, width ?? fallback, width !== null];
}

/**
 * The CSS height of a chart box whose chart is `perWidth` × its width + `offset` px tall, held
 * between `min` and `max` px: the same height the chart takes once its width is measured, given
 * by the browser before the page's scripts run. So the box does not grow or shrink at hydration
 * and nothing below it moves under a pointer (a tap on a button just below a chart landed on the
 * page instead). Needs an ancestor with `container-type: inline-size` of the box's width.
 */
export function widthLinkedHeight({ perWidth, offset = 0, min, max }: { perWidth: number; offset?: number; min: number; max: number }): string {
  const ratio = Number.isFinite(perWidth) ? perWidth : 1;
  return `clamp(${min}px, calc(100cqw * ${ratio.toPrecision(8)} + ${offset.toFixed(2)}px), ${max}px)`;
}
