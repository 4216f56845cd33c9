import { useMemo, useRef, type ReactNode } from 'react';
import { PanResponder, View, type LayoutChangeEvent } from 'react-native';
import { panWindow, zoomWindow, type TimeWindow } from './time-window';

type Props = {
  window: TimeWindow;
  duration: number;
  onChange: (window: TimeWindow) => void;
  children: ReactNode;
  testID: string;
};

type WheelLike = {
  deltaX: number;
  deltaY: number;
  ctrlKey: boolean;
  metaKey: boolean;
  shiftKey: boolean;
  nativeEvent: { offsetX?: number };
  preventDefault: () => void;
};

/**
 * Drag along a trace to move through time; on a wide screen, Ctrl (or ⌘) with the wheel, or a trackpad pinch,
 * zooms around the pointer and a sideways scroll moves along. A plain wheel still scrolls the page.
 */
export function TraceGestures({ window, duration, onChange, children, testID }: Props) {
  const width = useRef(0);
  // The responder is made once; these refs give it the window and handler of the latest render.
  const latest = useRef({ window, duration, onChange });
  latest.current = { window, duration, onChange };
  const dragFrom = useRef<TimeWindow | null>(null);

  const responder = useMemo(
    () =>
      PanResponder.create({
        onMoveShouldSetPanResponder: (_e, g) => Math.abs(g.dx) > 4 && Math.abs(g.dx) > Math.abs(g.dy),
        onPanResponderGrant: () => {
          dragFrom.current = latest.current.window;
        },
        onPanResponderMove: (_e, g) => {
          const from = dragFrom.current;
          if (!from || width.current === 0) return;
          // Dragging right brings earlier time into view, as paper under a finger would move.
          latest.current.onChange(panWindow(from, -g.dx / width.current, latest.current.duration));
        },
        onPanResponderRelease: () => {
          dragFrom.current = null;
        },
        onPanResponderTerminate: () => {
          dragFrom.current = null;
        },
      }),
    [],
  );

  const onWheel = (e: WheelLike) => {
    if (width.current === 0) return;
    const { window: w, duration: d, onChange: change } = latest.current;
    if (e.ctrlKey || e.metaKey) {
      e.preventDefault();
      const anchor = Math.min(1, Math.max(0, (e.nativeEvent.offsetX ?? width.current / 2) / width.current));
      change(zoomWindow(w, Math.exp(e.deltaY * 0.01), d, anchor));
    } else if (Math.abs(e.deltaX) > Math.abs(e.deltaY) || e.shiftKey) {
      e.preventDefault();
      const delta = Math.abs(e.deltaX) > Math.abs(e.deltaY) ? e.deltaX : e.deltaY;
      change(panWindow(w, delta / width.current, d));
    }
  };

  return (
    <View
      testID={testID}
      onLayout={(e: LayoutChangeEvent) => {
        width.current = e.nativeEvent.layout.width;
      }}
      // react-native-web passes onWheel through to the element; native builds ignore it.
      {...({ onWheel } as object)}
      style={{ cursor: 'grab' } as object}
      {...responder.panHandlers}
    >
      {children}
    </View>
  );
}
