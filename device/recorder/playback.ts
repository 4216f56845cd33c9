// expo-audio, the SDK's maintained successor of expo-av (which has no native build for SDK 55+), plays clips.
import { createAudioPlayer, type AudioPlayer } from 'expo-audio';

let player: AudioPlayer | null = null;

/** Plays a clip (a WAV's bytes); a second call replaces the first. */
export function playClip(wav: Uint8Array): () => void {
  player?.remove();
  const url = URL.createObjectURL(new Blob([wav as BlobPart], { type: 'audio/wav' }));
  player = createAudioPlayer(url);
  player.play();
  return () => {
    player?.pause();
    URL.revokeObjectURL(url);
  };
}
