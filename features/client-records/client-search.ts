import { useState } from 'react';
import type { SortDir } from '@/ui/data-table';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import type { ClientTableQuery } from '@/shared/protocol/practice';

type Sort = ClientTableQuery['sort'];
export type Retention = ClientTableQuery['retention'];

/**
 * The state of the searchable, sortable, paged client list: a new search, sort or retention filter goes back to
 * the first page; the same column twice turns the order round.
 */
export function useClientSearch(initialRetention: Retention = 'all') {
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search.trim());
  const [sort, setSort] = useState<{ key: Sort; dir: SortDir }>({ key: 'name', dir: 'asc' });
  const [retention, setRetentionState] = useState<Retention>(initialRetention);
  const [page, setPage] = useState(1);
  const [lastQ, setLastQ] = useState(q);
  if (q !== lastQ) {
    setLastQ(q);
    setPage(1);
  }
  const onSort = (key: string) => {
    setSort((s) => ({ key: key as Sort, dir: s.key === key && s.dir === 'asc' ? 'desc' : 'asc' }));
    setPage(1);
  };
  const setRetention = (value: Retention) => {
    setRetentionState(value);
    setPage(1);
  };
  return { search, setSearch, q, sort, onSort, retention, setRetention, page, setPage };
}
