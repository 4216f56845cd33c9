// The take length the operator chose, kept on the device: the same at every site and on the next visit, until
// they choose another.
import AsyncStorage from '@react-native-async-storage/async-storage';
import { useCallback, useEffect, useState } from 'react';

export const takeLengths = [10, 15, 20, 30] as const;
const storageKey = 'fourpoint.take-length-s.v1';

export async function readKeptTakeLength(): Promise<number | null> {
  const kept = Number(await AsyncStorage.getItem(storageKey));
  return (takeLengths as readonly number[]).includes(kept) ? kept : null;
}

/** The kept length, or `fallbackS` until one is chosen; choosing keeps it for every later take. */
export function useTakeLength(fallbackS: number): [number, (lengthS: number) => void] {
  const [lengthS, setLengthS] = useState(fallbackS);
  useEffect(() => {
    let cancelled = false;
    void readKeptTakeLength().then((kept) => {
      if (!cancelled && kept !== null) setLengthS(kept);
    });
    return () => {
      cancelled = true;
    };
  }, []);
  const choose = useCallback((next: number) => {
    setLengthS(next);
    void AsyncStorage.setItem(storageKey, String(next));
  }, []);
  return [lengthS, choose];
}
