import { clampWindow, panWindow, zoomWindow } from './time-window';

// Expected values are worked by hand from the definitions above (no outside source).
describe('the window a trace shows', () => {
  test('when zoomed in around the pointer, then the moment under it stays at the same place on screen', () => {
    const w = zoomWindow({ start: 2, end: 6 }, 0.5, 20, 0.25);
    // The pointer a quarter of the way along points at 3 s before and after.
    expect(w.start + (w.end - w.start) * 0.25).toBeCloseTo(3, 10);
    expect(w.end - w.start).toBeCloseTo(2, 10);
  });

  test('when zoomed out past the clip, then it shows the whole clip and no more', () => {
    expect(zoomWindow({ start: 4, end: 8 }, 8, 12)).toEqual({ start: 0, end: 12 });
  });

  test('when zoomed in very far, then it stops at a quarter second', () => {
    const w = zoomWindow({ start: 1, end: 1.5 }, 0.01, 10);
    expect(w.end - w.start).toBeCloseTo(0.25, 10);
  });

  test('when moved past either end, then it stops at the end of the clip and keeps its length', () => {
    expect(panWindow({ start: 1, end: 3 }, -2, 10)).toEqual({ start: 0, end: 2 });
    expect(panWindow({ start: 7, end: 9 }, 3, 10)).toEqual({ start: 8, end: 10 });
  });

  test('when a window is shorter than the shortest span, then it is widened to it', () => {
    expect(clampWindow({ start: 5, end: 5.1 }, 10)).toEqual({ start: 5, end: 5.25 });
  });
});
