import { fireEvent, render, screen } from '@testing-library/react-native';
import { Text } from 'react-native';
import { QueryView } from './state-views';

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
});
