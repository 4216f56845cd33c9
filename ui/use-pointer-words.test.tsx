import { act, render, screen } from '@testing-library/react-native';
import { Text } from 'react-native';
import { usePointerWords } from './use-pointer-words';

function Hint() {
  return <Text testID="hint">{`${usePointerWords().Verb} to keep`}</Text>;
}

/** A stand-in for the browser's media query list (the CSS Media Queries Level 4 `pointer` feature). */
function fakePointer(coarse: boolean) {
  const listeners = new Set<() => void>();
  const list = {
    matches: coarse,
    addEventListener: (_: string, f: () => void) => listeners.add(f),
    removeEventListener: (_: string, f: () => void) => listeners.delete(f),
  };
  Object.defineProperty(window, 'matchMedia', {
    configurable: true,
    value: (query: string) => {
      expect(query).toBe('(pointer: coarse)');
      return list;
    },
  });
  return {
    change(next: boolean) {
      list.matches = next;
      listeners.forEach((f) => f());
    },
  };
}

afterEach(() => {
  delete (window as { matchMedia?: unknown }).matchMedia;
});

describe('usePointerWords', () => {
  test('when the main pointer is a mouse, then the words say click', () => {
    fakePointer(false);
    render(<Hint />);
    expect(screen.getByTestId('hint')).toHaveTextContent('Click to keep');
  });

  test('when the main pointer is a finger, then the words say tap, and follow a change of pointer', () => {
    const pointer = fakePointer(true);
    render(<Hint />);
    expect(screen.getByTestId('hint')).toHaveTextContent('Tap to keep');
    act(() => pointer.change(false));
    expect(screen.getByTestId('hint')).toHaveTextContent('Click to keep');
  });
});
