// Which audio input a take comes from: the phone's own microphone, or a digital stethoscope or sensor plugged in
// (USB or Bluetooth), which the browser lists as one more audio input. The choice is kept on the device.
import AsyncStorage from '@react-native-async-storage/async-storage';
import { useCallback, useEffect, useState } from 'react';

export type AudioInput = { deviceId: string; label: string };

const storageKey = 'fourpoint.audio-input.v1';

/**
 * The inputs the browser offers, without the "default" and "communications" aliases of another entry. Labels are
 * empty until the microphone has been allowed once, so those read "Input 1", "Input 2"…
 */
export async function listAudioInputs(): Promise<AudioInput[]> {
  const media = globalThis.navigator?.mediaDevices;
  if (!media?.enumerateDevices) return [];
  const devices = await media.enumerateDevices();
  return devices
    .filter(
      (d) => d.kind === 'audioinput' && d.deviceId && !['default', 'communications'].includes(d.deviceId),
    )
    .map((d, i) => ({ deviceId: d.deviceId, label: d.label.trim() || `Input ${i + 1}` }));
}

export async function readChosenInput(): Promise<string | null> {
  return AsyncStorage.getItem(storageKey);
}

/** The inputs, the one chosen (null: the browser's default), and a way to choose; follows plugging in and out. */
export function useAudioInputs() {
  const [inputs, setInputs] = useState<AudioInput[]>([]);
  const [chosen, setChosen] = useState<string | null>(null);

  const refresh = useCallback(async () => {
    const [list, kept] = await Promise.all([listAudioInputs().catch(() => []), readChosenInput()]);
    setInputs(list);
    setChosen(kept);
  }, []);

  useEffect(() => {
    void refresh();
    const media = globalThis.navigator?.mediaDevices;
    media?.addEventListener?.('devicechange', refresh);
    return () => media?.removeEventListener?.('devicechange', refresh);
  }, [refresh]);

  const choose = useCallback(async (deviceId: string | null) => {
    setChosen(deviceId);
    if (deviceId) await AsyncStorage.setItem(storageKey, deviceId);
    else await AsyncStorage.removeItem(storageKey);
  }, []);

  // A kept choice that is not plugged in now still shows, so the operator sees why recording would fail.
  const chosenMissing = chosen !== null && inputs.length > 0 && !inputs.some((i) => i.deviceId === chosen);
  return { inputs, chosen, chosenMissing, choose, refresh };
}
