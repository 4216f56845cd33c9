import { renderHook } from '@testing-library/react-native';
import { layoutForWidth, useLayout } from './use-layout';

const mockDimensions = { width: 0, height: 0, scale: 1, fontScale: 1 };
jest.mock('react-native/Libraries/Utilities/useWindowDimensions', () => ({
  __esModule: true,
  default: () => mockDimensions,
}));

function windowOf(width: number, height: number) {
  mockDimensions.width = width;
  mockDimensions.height = height;
}

describe('useLayout', () => {
  test('when the window is 390x844 (the phone target), then the layout is phone', () => {
    windowOf(390, 844);
    const { result } = renderHook(() => useLayout());
    expect(result.current).toEqual({ kind: 'phone', isWide: false, width: 390, height: 844 });
  });

  test('when the window is 1440x900 (the wide target), then the layout is wide', () => {
    windowOf(1440, 900);
    const { result } = renderHook(() => useLayout());
    expect(result.current).toEqual({ kind: 'wide', isWide: true, width: 1440, height: 900 });
  });

  test('when the width crosses the breakpoint, then the kind flips exactly there', () => {
    expect(layoutForWidth(899)).toBe('phone');
    expect(layoutForWidth(900)).toBe('wide');
  });
});
