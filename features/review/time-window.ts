// The stretch of a clip a trace shows, and the moves that change it. Pure, so the buttons, the drag and the
// wheel all move it by the same rules.
export type TimeWindow = { start: number; end: number };

/** The shortest stretch a trace zooms to: a quarter second still shows one heart sound whole. */
export const MIN_SPAN_S = 0.25;

/** Keeps the window inside the clip and no shorter than MIN_SPAN_S (nor longer than the clip). */
export function clampWindow(w: TimeWindow, duration: number): TimeWindow {
  const span = Math.min(duration, Math.max(MIN_SPAN_S, w.end - w.start));
  const start = Math.min(Math.max(0, w.start), Math.max(0, duration - span));
  return { start, end: start + span };
}

/**
 * Zooms by `factor` (below 1 zooms in) keeping the moment under `anchor` (0 = left edge, 1 = right edge) where it
 * is on screen, as a map zooms around the pointer.
 */
export function zoomWindow(w: TimeWindow, factor: number, duration: number, anchor = 0.5): TimeWindow {
  const span = w.end - w.start;
  const at = w.start + span * anchor;
  const next = Math.min(duration, Math.max(MIN_SPAN_S, span * factor));
  return clampWindow({ start: at - next * anchor, end: at - next * anchor + next }, duration);
}

/** Moves along time by `fraction` of the window's own length (negative: earlier). */
export function panWindow(w: TimeWindow, fraction: number, duration: number): TimeWindow {
  const shift = (w.end - w.start) * fraction;
  return clampWindow({ start: w.start + shift, end: w.end + shift }, duration);
}
