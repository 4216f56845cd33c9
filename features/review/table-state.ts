import { useState } from 'react';
import type { ReviewSort } from '@/shared/protocol/review';

/** Sorting by a column: again on the same column turns the order round; dates start newest first. */
export function useSessionSort() {
  const [sort, setSort] = useState<{ key: ReviewSort; dir: 'asc' | 'desc' }>({
    key: 'startedAt',
    dir: 'desc',
  });
  const onSort = (key: ReviewSort) =>
    setSort(
      key === sort.key
        ? { key, dir: sort.dir === 'asc' ? 'desc' : 'asc' }
        : { key, dir: key === 'startedAt' ? 'desc' : 'asc' },
    );
  return { sort, onSort };
}

/** The server pages by cursor: the cursors of the pages seen so far, back to the first when the query changes. */
export function useCursorPages(queryKey: string) {
  const [cursors, setCursors] = useState<(string | null)[]>([null]);
  const [lastKey, setLastKey] = useState(queryKey);
  if (lastKey !== queryKey) {
    setLastKey(queryKey);
    setCursors([null]);
  }
  return {
    page: cursors.length,
    cursor: lastKey === queryKey ? cursors[cursors.length - 1] : null,
    back: () => setCursors(cursors.slice(0, -1)),
    forward: (next: string) => setCursors([...cursors, next]),
  };
}
