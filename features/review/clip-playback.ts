// The one place review playback touches an audio API (expo-audio, the SDK's successor to expo-av), so
// swapping the package is one file.
import { createAudioPlayer, type AudioPlayer } from 'expo-audio';
import { useCallback, useEffect, useRef, useState } from 'react';

export type Playback = {
  playingKey: string | null;
  positionS: number;
  error: string | null;
  play: (key: string, load: () => Promise<string>) => Promise<void>;
  stop: () => void;
};

export function usePlayback(): Playback {
  const player = useRef<AudioPlayer | null>(null);
  const url = useRef<string | null>(null);
  const frame = useRef<number | null>(null);
  const [playingKey, setPlayingKey] = useState<string | null>(null);
  const [positionS, setPositionS] = useState(0);
  const [error, setError] = useState<string | null>(null);

  const stop = useCallback(() => {
    if (frame.current !== null) cancelAnimationFrame(frame.current);
    frame.current = null;
    player.current?.pause();
    player.current?.remove();
    player.current = null;
    if (url.current) URL.revokeObjectURL(url.current);
    url.current = null;
    setPlayingKey(null);
  }, []);

  const play = useCallback(
    async (key: string, load: () => Promise<string>) => {
      stop();
      setError(null);
      try {
        url.current = await load();
      } catch (e) {
        setError(e instanceof Error ? e.message : 'The clip could not be loaded.');
        return;
      }
      const p = createAudioPlayer(url.current);
      player.current = p;
      setPlayingKey(key);
      setPositionS(0);
      p.play();
      const tick = () => {
        if (player.current !== p) return;
        setPositionS(p.currentTime);
        if (p.duration > 0 && p.currentTime >= p.duration - 0.01 && !p.playing) {
          stop();
          return;
        }
        frame.current = requestAnimationFrame(tick);
      };
      frame.current = requestAnimationFrame(tick);
    },
    [stop],
  );

  useEffect(() => stop, [stop]);
  return { playingKey, positionS, error, play, stop };
}
