import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { TextInput } from 'react-native';
import type { ApiResult } from '@/api/result';
import { httpFailure } from '@/shared/http-failure';
import type { SignInResponse } from '@/shared/protocol';
import { SignInForm } from './sign-in-form';

type Answer = ApiResult<SignInResponse>;

function setup(answer: Answer) {
  const onSubmit = jest.fn(async () => answer);
  render(<SignInForm onSubmit={onSubmit} />);
  return onSubmit;
}

// The server's `{ error: { code, message } }` body, read by the app's one mapping of failed answers.
const serverSays = (message: string) => ({ error: { code: 'refused', message } });

function fill(email: string, password: string) {
  fireEvent.changeText(screen.getByTestId('sign-in-email'), email);
  fireEvent.changeText(screen.getByTestId('sign-in-password'), password);
  fireEvent.press(screen.getByTestId('sign-in-submit'));
}

const okAnswer: Answer = {
  kind: 'ok',
  data: {
    accessToken: 'a',
    refreshToken: 'r',
    user: {
      id: '6a0d3f51-4f7e-4d0b-9d7e-2d7f1d1c0a11',
      email: 'sign-in-form@demo.fourpoint.test',
      role: 'operator',
      clinicId: '0c6f1b2e-8f0f-4c55-9a51-6f3b8a1d2e33',
      timeZone: 'UTC',
      name: 'Form Tester',
    },
  },
};

describe('sign-in form', () => {
  test('when submitted empty, then both fields say what is missing and nothing is sent', async () => {
    const onSubmit = setup(okAnswer);
    fill('', '');
    expect(await screen.findByTestId('sign-in-email-error')).toHaveTextContent(
      'Enter a valid e-mail address.',
    );
    expect(screen.getByTestId('sign-in-password-error')).toHaveTextContent('Enter your password.');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when the e-mail is malformed, then only the e-mail field shows an error', async () => {
    const onSubmit = setup(okAnswer);
    fill('not-an-address', 'secret');
    expect(await screen.findByTestId('sign-in-email-error')).toHaveTextContent(
      'Enter a valid e-mail address.',
    );
    expect(screen.queryByTestId('sign-in-password-error')).toBeNull();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when the fields are valid, then the trimmed lower-case e-mail and the password are sent', async () => {
    const onSubmit = setup(okAnswer);
    fill('  Someone@Clinic.Example ', 'pw');
    await waitFor(() =>
      expect(onSubmit).toHaveBeenCalledWith({ email: 'someone@clinic.example', password: 'pw' }),
    );
    expect(screen.queryByTestId('sign-in-error')).toBeNull();
  });

  test("when the server answers 401, then the server's message is shown", async () => {
    setup(httpFailure(401, serverSays('That e-mail and password do not match an account.')));
    fill('someone@clinic.example', 'wrong');
    expect(await screen.findByTestId('sign-in-error')).toHaveTextContent(
      'That e-mail and password do not match an account.',
    );
  });

  test("when the server answers 429, then the server's wait message is shown", async () => {
    setup(httpFailure(429, serverSays('Too many sign-in attempts. Try again in 15 minutes.')));
    fill('someone@clinic.example', 'wrong');
    expect(await screen.findByTestId('sign-in-error')).toHaveTextContent(
      'Too many sign-in attempts. Try again in 15 minutes.',
    );
  });

  test('when the network is unreachable, then the form says so', async () => {
    setup(httpFailure(undefined, undefined));
    fill('someone@clinic.example', 'pw');
    expect(await screen.findByTestId('sign-in-error')).toHaveTextContent(/Network unreachable/);
  });

  test('when the e-mail is submitted from the keyboard, then focus moves to the password field', () => {
    const focus = jest.spyOn(TextInput.prototype, 'focus');
    try {
      setup(okAnswer);
      fireEvent(screen.getByTestId('sign-in-email'), 'submitEditing');
      expect(focus).toHaveBeenCalledTimes(1);
      expect((focus.mock.contexts[0] as TextInput).props.testID).toBe('sign-in-password');
    } finally {
      focus.mockRestore();
    }
  });

  test('when the password is submitted from the keyboard, then the form is sent', async () => {
    const onSubmit = setup(okAnswer);
    fireEvent.changeText(screen.getByTestId('sign-in-email'), 'someone@clinic.example');
    fireEvent.changeText(screen.getByTestId('sign-in-password'), 'pw');
    fireEvent(screen.getByTestId('sign-in-password'), 'submitEditing');
    await waitFor(() =>
      expect(onSubmit).toHaveBeenCalledWith({ email: 'someone@clinic.example', password: 'pw' }),
    );
  });
});
