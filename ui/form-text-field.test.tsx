import { zodResolver } from '@hookform/resolvers/zod';
import { createRef, type Ref } from 'react';
import { useForm } from 'react-hook-form';
import { TextInput } from 'react-native';
import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { z } from 'zod';
import { Button } from './button';
import { FormTextField } from './form-text-field';

const schema = z.object({ code: z.string().trim().min(3, { error: 'At least 3 characters.' }) });

function Probe({ inputRef, onValid }: { inputRef?: Ref<TextInput>; onValid: (code: string) => void }) {
  const { control, handleSubmit } = useForm<z.input<typeof schema>>({
    resolver: zodResolver(schema),
    defaultValues: { code: '' },
  });
  return (
    <>
      <FormTextField ref={inputRef} control={control} name="code" label="Code" testID="probe-code" />
      <Button label="Go" testID="probe-go" onPress={handleSubmit((v) => onValid(v.code))} />
    </>
  );
}

describe('FormTextField', () => {
  test('when given a ref, then the ref reaches the text input with the field testID', () => {
    const ref = createRef<TextInput>();
    render(<Probe inputRef={ref} onValid={jest.fn()} />);
    expect(ref.current).toBeInstanceOf(TextInput);
    expect(screen.getByTestId('probe-code')).toBeTruthy();
  });

  test('when the value fails the schema, then the schema message shows under <testID>-error', async () => {
    const onValid = jest.fn();
    render(<Probe onValid={onValid} />);
    fireEvent.changeText(screen.getByTestId('probe-code'), 'ab');
    fireEvent.press(screen.getByTestId('probe-go'));
    expect(await screen.findByTestId('probe-code-error')).toHaveTextContent('At least 3 characters.');
    expect(onValid).not.toHaveBeenCalled();
  });

  test('when the value is typed and valid, then the form receives exactly what was typed', async () => {
    const onValid = jest.fn();
    render(<Probe onValid={onValid} />);
    fireEvent.changeText(screen.getByTestId('probe-code'), 'abc');
    fireEvent.press(screen.getByTestId('probe-go'));
    await waitFor(() => expect(onValid).toHaveBeenCalledWith('abc'));
    expect(screen.queryByTestId('probe-code-error')).toBeNull();
  });
});
