import { fireEvent, render, screen } from '@testing-library/react-native';
import { Text } from 'react-native';
import { PagedQueryView, QueryView } from './state-views';

const base = { isPending: false, isError: false, error: null, data: undefined, refetch: jest.fn() };

describe('a query on screen', () => {
  test('when it is loading, then the loading state shows with its words', () => {
    render(
      <QueryView query={{ ...base, isPending: true }} loading="Loading the ranges…" testID="ranges">
        {() => <Text>ranges</Text>}
      </QueryView>,
    );
    expect(screen.getByTestId('ranges-loading')).toHaveTextContent('Loading the ranges…');
    expect(screen.queryByText('ranges')).toBeNull();
  });

  test('when it failed, then its message shows and "Try again" asks again', () => {
    const refetch = jest.fn();
    render(
      <QueryView
        query={{ ...base, isError: true, error: new Error('Network unreachable.'), refetch }}
        loading="Loading the ranges…"
        testID="ranges"
      >
        {() => <Text>ranges</Text>}
      </QueryView>,
    );
    expect(screen.getByTestId('ranges-error')).toHaveTextContent(/Network unreachable\./);
    fireEvent.press(screen.getByTestId('ranges-error-retry'));
    expect(refetch).toHaveBeenCalledTimes(1);
  });

  test('when it has data, then the content is drawn from it', () => {
    render(
      <QueryView query={{ ...base, data: { count: 3 } }} loading="Loading…" testID="things">
        {(data) => <Text>{`${data.count} things`}</Text>}
      </QueryView>,
    );
    expect(screen.getByText('3 things')).toBeTruthy();
    expect(screen.queryByTestId('things-loading')).toBeNull();
  });

  test('when the answer is empty, then the empty state says so in its words instead of the content', () => {
    render(
      <QueryView
        query={{ ...base, data: [] as string[] }}
        loading="Loading…"
        testID="mail"
        empty={{ title: 'No mail yet', detail: 'Sent mail lands here.' }}
      >
        {() => <Text>list</Text>}
      </QueryView>,
    );
    expect(screen.getByTestId('mail-empty')).toHaveTextContent(/No mail yet.*Sent mail lands here\./);
    expect(screen.queryByText('list')).toBeNull();
  });

  test('when a list has items and no `when` is given, then its content shows, not the empty state', () => {
    render(
      <QueryView
        query={{ ...base, data: ['one'] }}
        loading="Loading…"
        testID="mail"
        empty={{ title: 'No mail yet' }}
      >
        {(items) => <Text>{items.join(',')}</Text>}
      </QueryView>,
    );
    expect(screen.getByText('one')).toBeTruthy();
    expect(screen.queryByTestId('mail-empty')).toBeNull();
  });

  test('when a page of a list arrives, then its rows show with a pager over the page the server answered', () => {
    const onPage = jest.fn();
    const data = { rows: ['a', 'b'], pageInfo: { page: 2, pageSize: 2, total: 5 } };
    render(
      <PagedQueryView
        query={{ ...base, data }}
        loading="Loading…"
        testID="rows"
        empty={{ when: (d) => d.rows.length === 0, title: 'None' }}
        onPage={onPage}
      >
        {(d) => <Text>{d.rows.join(',')}</Text>}
      </PagedQueryView>,
    );
    expect(screen.getByText('a,b')).toBeTruthy();
    expect(screen.getByTestId('rows-pager-range')).toHaveTextContent('3–4 of 5');
    expect(screen.queryByTestId('rows-empty')).toBeNull();
  });
});
