import { fireEvent, render, screen } from '@testing-library/react-native';
import type { ResolveConflictRequest } from '@/shared/protocol/sync';
import type { DifferingField } from './field-picker';
import { ResolveForm } from './resolve-form';

// The server accepts a field-by-field resolution only when it names exactly the differing fields
// (tests/server/sync-conflicts-pull.test.ts); the form must not send anything short of that.
const differing: DifferingField[] = [
  { field: 'notes', server: 'Room 2 note', client: 'Front desk note' },
  { field: 'email', server: null, client: 'picker.case@example.test' },
];

function setup(fields = differing) {
  const onSubmit = jest.fn<void, [ResolveConflictRequest]>();
  render(<ResolveForm differing={fields} onSubmit={onSubmit} wide />);
  return onSubmit;
}

describe('conflict field-by-field picker', () => {
  test('when field by field is chosen, then each differing field offers both values, neither chosen', () => {
    setup();
    fireEvent.press(screen.getByTestId('resolve-keep-fields'));
    expect(screen.getByTestId('pick-notes-server-value')).toHaveTextContent('Room 2 note');
    expect(screen.getByTestId('pick-notes-client-value')).toHaveTextContent('Front desk note');
    expect(screen.getByTestId('pick-email-server-value')).toHaveTextContent('(empty)');
    expect(screen.getByTestId('pick-email-client-value')).toHaveTextContent('picker.case@example.test');
    expect(screen.getByTestId('pick-notes-state')).toHaveTextContent('Not chosen yet');
    expect(screen.getByTestId('pick-notes-server')).not.toBeChecked();
  });

  test('when a side is picked, then the choice is stated in words and as the checked option, not by colour alone', () => {
    setup();
    fireEvent.press(screen.getByTestId('resolve-keep-fields'));
    fireEvent.press(screen.getByTestId('pick-email-client'));
    expect(screen.getByTestId('pick-email-state')).toHaveTextContent('Keeping the change');
    expect(screen.getByTestId('pick-email-client')).toHaveTextContent(/KEEPING THE CHANGE/);
    expect(screen.getByTestId('pick-email-client')).toBeChecked();
    expect(screen.getByTestId('pick-email-server')).not.toBeChecked();

    fireEvent.press(screen.getByTestId('pick-email-server'));
    expect(screen.getByTestId('pick-email-state')).toHaveTextContent('Keeping the record');
    expect(screen.getByTestId('pick-email-client')).not.toBeChecked();
  });

  test('when a differing field is left unpicked, then submit names it and nothing is sent', () => {
    const onSubmit = setup();
    fireEvent.press(screen.getByTestId('resolve-keep-fields'));
    fireEvent.press(screen.getByTestId('pick-notes-server'));
    fireEvent.changeText(screen.getByTestId('resolve-note'), 'Kept the room note.');
    fireEvent.press(screen.getByTestId('resolve-submit'));
    expect(screen.getByTestId('resolve-fields-error')).toHaveTextContent('Pick a side for: E-mail.');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when every field is picked but the note is blank, then the note is asked for and nothing is sent', () => {
    const onSubmit = setup();
    fireEvent.press(screen.getByTestId('resolve-keep-fields'));
    fireEvent.press(screen.getByTestId('pick-notes-server'));
    fireEvent.press(screen.getByTestId('pick-email-client'));
    fireEvent.changeText(screen.getByTestId('resolve-note'), '   ');
    fireEvent.press(screen.getByTestId('resolve-submit'));
    expect(screen.getByTestId('resolve-note-error')).toHaveTextContent('Write a short note on why.');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when every field is picked and a note written, then one request carries each side and the trimmed note', () => {
    const onSubmit = setup();
    fireEvent.press(screen.getByTestId('resolve-keep-fields'));
    fireEvent.press(screen.getByTestId('pick-notes-client'));
    fireEvent.press(screen.getByTestId('pick-notes-server'));
    fireEvent.press(screen.getByTestId('pick-email-client'));
    fireEvent.changeText(screen.getByTestId('resolve-note'), '  Room note stays; new e-mail is right.  ');
    fireEvent.press(screen.getByTestId('resolve-submit'));
    expect(onSubmit).toHaveBeenCalledTimes(1);
    expect(onSubmit).toHaveBeenCalledWith({
      keep: 'fields',
      fields: { notes: 'server', email: 'client' },
      note: 'Room note stays; new e-mail is right.',
    });
  });

  test('when nothing is chosen, then submit asks for a choice; keeping one version sends no field list', () => {
    const onSubmit = setup();
    fireEvent.changeText(screen.getByTestId('resolve-note'), 'The phone was right.');
    fireEvent.press(screen.getByTestId('resolve-submit'));
    expect(screen.getByTestId('resolve-keep-error')).toHaveTextContent(/Choose how to settle it/);
    expect(onSubmit).not.toHaveBeenCalled();

    fireEvent.press(screen.getByTestId('resolve-keep-client'));
    expect(screen.queryByTestId('field-picker')).toBeNull();
    fireEvent.press(screen.getByTestId('resolve-submit'));
    expect(onSubmit).toHaveBeenCalledWith({ keep: 'client', note: 'The phone was right.' });
  });
});
