import { useSyncExternalStore } from 'react';
import { Platform } from 'react-native';

const coarseQuery = '(pointer: coarse)';

function media(): MediaQueryList | null {
  return typeof window !== 'undefined' && typeof window.matchMedia === 'function'
    ? window.matchMedia(coarseQuery)
    : null;
}

function subscribe(onChange: () => void): () => void {
  const list = media();
  list?.addEventListener?.('change', onChange);
  return () => list?.removeEventListener?.('change', onChange);
}

/** A finger is the main pointer: a phone or tablet's browser, or the native app. */
function isTouch(): boolean {
  const list = media();
  return list ? list.matches : Platform.OS !== 'web';
}

export type PointerWords = {
  /** "Tap" or "Click", to start a sentence. */
  Verb: string;
  /** "tap" or "click", inside a sentence. */
  verb: string;
};

export function pointerWordsFor(touch: boolean): PointerWords {
  return touch ? { Verb: 'Tap', verb: 'tap' } : { Verb: 'Click', verb: 'click' };
}

/**
 * Words for pointing at something, matching the device in hand: "Tap" where the main pointer is a finger, "Click"
 * where it is a mouse or trackpad (the CSS `pointer` media feature). Follows a change, e.g. a tablet docked to a
 * keyboard and trackpad.
 */
export function usePointerWords(): PointerWords {
  const touch = useSyncExternalStore(subscribe, isTouch, isTouch);
  return pointerWordsFor(touch);
}
