import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { AuditFilters } from './audit-filters';

describe('AuditFilters', () => {
  test('when the end date is before the start date, then the To field says so and nothing is applied', async () => {
    const onApply = jest.fn();
    render(<AuditFilters onApply={onApply} />);
    fireEvent.changeText(screen.getByTestId('audit-filter-from'), '2026-03-31');
    fireEvent.changeText(screen.getByTestId('audit-filter-to'), '2026-03-01');
    fireEvent.press(screen.getByTestId('audit-filter-apply'));
    expect(await screen.findByTestId('audit-filter-to-error')).toHaveTextContent(
      'The end date is before the start date.',
    );
    expect(screen.queryByTestId('audit-filter-from-error')).toBeNull();
    expect(onApply).not.toHaveBeenCalled();
  });

  test('when a date is not in YYYY-MM-DD form, then that field asks for one', async () => {
    const onApply = jest.fn();
    render(<AuditFilters onApply={onApply} />);
    fireEvent.changeText(screen.getByTestId('audit-filter-from'), '31/03/2026');
    fireEvent.press(screen.getByTestId('audit-filter-apply'));
    expect(await screen.findByTestId('audit-filter-from-error')).toHaveTextContent(
      'Choose a day on the calendar, or type it as YYYY-MM-DD.',
    );
    expect(onApply).not.toHaveBeenCalled();
  });

  test('when Enter is pressed in a field, then the trimmed filters are applied', async () => {
    const onApply = jest.fn();
    render(<AuditFilters onApply={onApply} />);
    fireEvent.changeText(screen.getByTestId('audit-filter-client'), ' Wren Halloway ');
    fireEvent(screen.getByTestId('audit-filter-client'), 'submitEditing');
    await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][0]).toEqual({ client: 'Wren Halloway', from: '', to: '' });
  });
});
