import { fireEvent, screen } from '@testing-library/react-native';

/**
 * Form tests name a field `${form}-${field}` and its message `${form}-${field}-error` (`useFormBinding`'s test ids).
 * Types each value into its field.
 */
export function fillFields(form: string, values: Record<string, string>): void {
  for (const [field, text] of Object.entries(values))
    fireEvent.changeText(screen.getByTestId(`${form}-${field}`), text);
}

/** Presses the form's button and expects every field named to say its message. */
export async function submitExpectingErrors(
  form: string,
  button: string,
  errors: Record<string, string>,
): Promise<void> {
  fireEvent.press(screen.getByTestId(button));
  const [first, ...rest] = Object.entries(errors);
  if (!first) throw new Error('Name at least one field that should say what is wrong.');
  expect(await screen.findByTestId(`${form}-${first[0]}-error`)).toHaveTextContent(first[1]);
  for (const [field, message] of rest)
    expect(screen.getByTestId(`${form}-${field}-error`)).toHaveTextContent(message);
}
