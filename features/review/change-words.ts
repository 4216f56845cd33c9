import { formatValue } from './measurements-table';

export type ChangeWords = { arrow: '↑' | '↓' | '→' | ''; words: string };

/**
 * A change between two visits as an arrow and in words ("↑ higher by 12 bpm"). A change too small to show at the
 * figure's own precision reads "about the same"; it says nothing of whether the change matters.
 */
export function changeWords(then: number | null, now: number | null, unit = ''): ChangeWords {
  if (then === null || now === null) return { arrow: '', words: 'not measured at both visits' };
  const change = now - then;
  const shown = formatValue(Math.abs(change), unit);
  if (Number(formatValue(Math.abs(change))) === 0) return { arrow: '→', words: 'about the same' };
  return change > 0
    ? { arrow: '↑', words: `higher by ${shown}` }
    : { arrow: '↓', words: `lower by ${shown}` };
}
