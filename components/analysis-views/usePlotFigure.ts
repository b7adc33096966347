"use client";
import { useEffect, useRef, useState } from "react";

type Figure = SVGSVGElement | HTMLElement;

/**
 * Draws an Observable Plot figure into the returned holder div at the holder's width, and replaces it (removing
 * the old one) whenever the width or `deps` change. Returns the holder ref and the last drawing error, if any.
 */
export function usePlotFigure(
  build: (width: number) => Figure | null,
  deps: unknown[],
  options: { minWidth?: number; onRendered?: (figure: Figure) => void } = {},
) {
  const holder = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  const [error, setError] = useState<string | null>(null);
  const minWidth = options.minWidth ?? 320;

  useEffect(() => {
    const element = holder.current;
    if (!element) return;
    const observer = new ResizeObserver(([entry]) => setWidth(Math.max(minWidth, Math.floor(entry.contentRect.width))));
    observer.observe(element);
    return () => observer.disconnect();
  }, [minWidth]);

  useEffect(() => {
    const element = holder.current;
    if (!element || width === 0) return;
    let figure: Figure | null = null;
    // the figure is drawn into the DOM at the holder's measured width, so it is made here, and only here can a drawing
    // error be known: it is shown by a state update, at most once per drawing
    /* eslint-disable react-hooks/set-state-in-effect */
    try {
      figure = build(width);
      setError(null);
    } catch (cause) {
      setError(cause instanceof Error ? cause.message : "The chart could not be drawn.");
    }
    /* eslint-enable react-hooks/set-state-in-effect */
    if (figure) {
      element.append(figure);
      options.onRendered?.(figure);
    }
    return () => figure?.remove();
    // the caller's `deps` are forwarded as they are (a generic hook, like useMemo itself)
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [width, ...deps]);

  return { holder, error };
}
