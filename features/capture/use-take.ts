import { useCallback, useEffect, useRef, useState } from 'react';
import { analyseInWorker, warmAnalysisWorker } from '@/device/analysis-worker/analyse-in-worker';
import type { DisplayTrace, RecordingSource } from '@/device/local-store/records';
import { ImportError, pickAudioFile } from '@/device/recorder/import-file';
import { openMicrophone, RecorderError, type LiveMicrophone, type Pcm } from '@/device/recorder/recorder';
import type { AnalysisResult } from '@/shared/analysis/types';
import type { Site } from '@/shared/protocol';

/** Below this there is nothing to analyse; the analysis itself judges whether a longer clip is long enough. */
export const minimumTakeS = 1;

export type TakeResult = { pcm: Pcm; analysis: AnalysisResult; trace: DisplayTrace; source: RecordingSource };

export type TakeState =
  | { phase: 'idle' }
  | { phase: 'starting' }
  | { phase: 'recording'; startedAt: number; level: number; elapsedS: number }
  | { phase: 'analysing'; source: RecordingSource }
  | { phase: 'done'; result: TakeResult }
  | { phase: 'error'; message: string; kind: string };

type Timing = { site: Site; endToTraceMs: number; workerMs: number; stopMs: number };
declare global {
  var __fourpointTimings: Timing[] | undefined;
}

function tooShort(pcm: Pcm): string | null {
  const seconds = pcm.samples.length / pcm.sampleRate;
  return seconds < minimumTakeS
    ? `The clip lasts ${seconds.toFixed(1)} s; record or import at least ${minimumTakeS} s (the chosen length is best).`
    : null;
}

/** One site's take: microphone with live level and countdown, or an imported file, then analysis off the UI thread. */
export function useTake(
  site: Site,
  lengthS: number,
  inputId: string | null = null,
  onMicrophoneOpened?: () => void,
) {
  const [state, setState] = useState<TakeState>({ phase: 'idle' });
  const mic = useRef<LiveMicrophone | null>(null);
  const frame = useRef<number | null>(null);
  const stopping = useRef(false);
  const endedAt = useRef<number | null>(null);

  const workerMs = useRef(0);
  const stages = useRef({ stopMs: 0 });
  useEffect(() => warmAnalysisWorker(), []);

  // Runs after the trace has been committed to the screen: the figure the 300 ms target is about.
  useEffect(() => {
    if (state.phase !== 'done' || state.result.source !== 'microphone' || endedAt.current === null) return;
    (globalThis.__fourpointTimings ??= []).push({
      site,
      endToTraceMs: performance.now() - endedAt.current,
      workerMs: workerMs.current,
      ...stages.current,
    });
    endedAt.current = null;
  }, [state, site]);

  const cleanup = useCallback(() => {
    if (frame.current !== null) cancelAnimationFrame(frame.current);
    frame.current = null;
    mic.current?.close();
    mic.current = null;
  }, []);
  useEffect(() => cleanup, [cleanup]);

  const analyse = useCallback(
    async (pcm: Pcm, source: RecordingSource) => {
      const short = tooShort(pcm);
      if (short) {
        setState({ phase: 'error', message: short, kind: 'too-short' });
        return;
      }
      setState({ phase: 'analysing', source });
      try {
        const out = await analyseInWorker(pcm.samples, pcm.sampleRate, site);
        workerMs.current = out.workerMs;
        setState({ phase: 'done', result: { pcm, analysis: out.analysis, trace: out.trace, source } });
      } catch (error) {
        setState({
          phase: 'error',
          message: error instanceof Error ? error.message : 'The analysis failed.',
          kind: 'analysis',
        });
      }
    },
    [site],
  );

  const stop = useCallback(async () => {
    const live = mic.current;
    if (!live || stopping.current) return;
    stopping.current = true;
    if (frame.current !== null) cancelAnimationFrame(frame.current);
    frame.current = null;
    endedAt.current = performance.now();
    try {
      const pcm = await live.stop();
      stages.current.stopMs = performance.now() - (endedAt.current ?? 0);
      live.close();
      mic.current = null;
      await analyse(pcm, 'microphone');
    } catch (error) {
      cleanup();
      setState({
        phase: 'error',
        message: error instanceof Error ? error.message : 'Recording failed.',
        kind: 'recorder',
      });
    } finally {
      stopping.current = false;
    }
  }, [analyse, cleanup]);

  const record = useCallback(async () => {
    cleanup();
    setState({ phase: 'starting' });
    try {
      const live = await openMicrophone(inputId);
      mic.current = live;
      // Input names are readable once the microphone is allowed: the picker can name them now.
      onMicrophoneOpened?.();
      const startedAt = performance.now();
      live.start();
      const tick = () => {
        const elapsedS = (performance.now() - startedAt) / 1000;
        if (elapsedS >= lengthS) {
          void stop();
          return;
        }
        setState({ phase: 'recording', startedAt, level: live.level(), elapsedS });
        frame.current = requestAnimationFrame(tick);
      };
      tick();
    } catch (error) {
      cleanup();
      const kind = error instanceof RecorderError ? error.kind : 'failed';
      setState({
        phase: 'error',
        message: error instanceof Error ? error.message : 'Recording failed.',
        kind,
      });
    }
  }, [cleanup, lengthS, stop, inputId, onMicrophoneOpened]);

  const importFile = useCallback(async () => {
    cleanup();
    try {
      const picked = await pickAudioFile();
      if (!picked) return;
      endedAt.current = null;
      await analyse(picked, 'import');
    } catch (error) {
      const message =
        error instanceof ImportError ? error.message : 'The file could not be read. Choose another file.';
      setState({ phase: 'error', message, kind: 'import' });
    }
  }, [analyse, cleanup]);

  const reset = useCallback(() => {
    cleanup();
    setState({ phase: 'idle' });
  }, [cleanup]);

  return { state, record, stop, importFile, reset };
}
