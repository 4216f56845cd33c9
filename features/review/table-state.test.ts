import { act, renderHook } from '@testing-library/react-native';
import { useCursorPages, useSessionSort } from './table-state';

describe('the session table sort', () => {
  test('when it opens, then the newest sessions come first', () => {
    const { result } = renderHook(() => useSessionSort());
    expect(result.current.sort).toEqual({ key: 'startedAt', dir: 'desc' });
  });

  test('when another column is chosen, then it sorts A to Z; chosen again, Z to A', () => {
    const { result } = renderHook(() => useSessionSort());
    act(() => result.current.onSort('clientName'));
    expect(result.current.sort).toEqual({ key: 'clientName', dir: 'asc' });
    act(() => result.current.onSort('clientName'));
    expect(result.current.sort).toEqual({ key: 'clientName', dir: 'desc' });
    act(() => result.current.onSort('startedAt'));
    expect(result.current.sort).toEqual({ key: 'startedAt', dir: 'desc' });
  });
});

describe('the session table pages', () => {
  test('when the practitioner pages forward and back, then each page asks with its own cursor', () => {
    const { result } = renderHook(() => useCursorPages('{"q":"a"}'));
    expect(result.current).toMatchObject({ page: 1, cursor: null });
    act(() => result.current.forward('c2'));
    expect(result.current).toMatchObject({ page: 2, cursor: 'c2' });
    act(() => result.current.forward('c3'));
    expect(result.current).toMatchObject({ page: 3, cursor: 'c3' });
    act(() => result.current.back());
    expect(result.current).toMatchObject({ page: 2, cursor: 'c2' });
  });

  test('when the filters change, then it starts again from the first page', () => {
    const { result, rerender } = renderHook(({ key }: { key: string }) => useCursorPages(key), {
      initialProps: { key: '{"q":"a"}' },
    });
    act(() => result.current.forward('c2'));
    rerender({ key: '{"q":"ab"}' });
    expect(result.current).toMatchObject({ page: 1, cursor: null });
  });
});
