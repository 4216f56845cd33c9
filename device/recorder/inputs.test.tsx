import AsyncStorage from '@react-native-async-storage/async-storage';
import { act, renderHook, waitFor } from '@testing-library/react-native';
import { listAudioInputs, readChosenInput, useAudioInputs } from './inputs';

// What enumerateDevices answers is the W3C Media Capture and Streams shape (MediaDeviceInfo: deviceId, kind,
// label, groupId); the "default" and "communications" aliases are Chromium's, from memory.
type Device = { deviceId: string; kind: string; label: string; groupId: string };
const device = (deviceId: string, kind: string, label = ''): Device => ({
  deviceId,
  kind,
  label,
  groupId: 'g',
});

function withDevices(devices: Device[]) {
  const listeners: (() => void)[] = [];
  Object.defineProperty(globalThis, 'navigator', {
    value: {
      mediaDevices: {
        enumerateDevices: jest.fn().mockResolvedValue(devices),
        addEventListener: (_: string, f: () => void) => listeners.push(f),
        removeEventListener: jest.fn(),
      },
    },
    configurable: true,
    writable: true,
  });
  return listeners;
}

const saved = globalThis.navigator;
afterEach(async () => {
  Object.defineProperty(globalThis, 'navigator', { value: saved, configurable: true, writable: true });
  await AsyncStorage.clear();
});

test('when the browser lists inputs, then aliases and outputs are left out and unnamed inputs get a number', async () => {
  withDevices([
    device('default', 'audioinput', 'Default - Built-in microphone'),
    device('mic-1', 'audioinput', 'Built-in microphone'),
    device('usb-2', 'audioinput', ''),
    device('speaker-1', 'audiooutput', 'Speakers'),
  ]);
  expect(await listAudioInputs()).toEqual([
    { deviceId: 'mic-1', label: 'Built-in microphone' },
    { deviceId: 'usb-2', label: 'Input 2' },
  ]);
});

test('when an input is chosen, then the choice is kept on the device, and a kept input that is unplugged shows as missing', async () => {
  const listeners = withDevices([
    device('mic-1', 'audioinput', 'Phone'),
    device('usb-2', 'audioinput', 'Sensor'),
  ]);
  const { result } = renderHook(() => useAudioInputs());
  await waitFor(() => expect(result.current.inputs).toHaveLength(2));
  await act(() => result.current.choose('usb-2'));
  expect(await readChosenInput()).toBe('usb-2');
  expect(result.current.chosenMissing).toBe(false);

  withDevices([device('mic-1', 'audioinput', 'Phone')]);
  await act(async () => listeners.forEach((f) => f()));
  await act(() => result.current.refresh());
  await waitFor(() => expect(result.current.chosenMissing).toBe(true));

  await act(() => result.current.choose(null));
  expect(await readChosenInput()).toBeNull();
});
