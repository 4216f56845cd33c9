import type { AnalysisResult } from '@/shared/analysis/types';
import type { Site } from '@/shared/protocol';

export type LocalClient = {
  id: string;
  firstName: string;
  lastName: string;
  dateOfBirth: string | null;
  email: string | null;
  phone: string | null;
  origin: 'device' | 'server';
  version: number;
  createdAt: string;
  updatedAt: string;
};

export type LocalConsent = {
  id: string;
  clientId: string;
  signedName: string;
  signedOn: string;
  textVersion: string;
  createdAt: string;
};

export type SessionStatus = 'in_progress' | 'completed';

export type LocalSession = {
  id: string;
  clientId: string;
  consentId: string;
  status: SessionStatus;
  /** 'review' once every site is recorded or skipped. */
  currentSite: Site | 'review';
  clipSeconds: number;
  startedAt: string;
  finishedAt: string | null;
  version: number;
  updatedAt: string;
};

/** A min/max pair per display column, from traceForDisplay. */
export type DisplayTrace = { min: number[]; max: number[]; durationS: number };

export type RecordingSource = 'microphone' | 'import';

export type SiteRecording = {
  id: string;
  sessionId: string;
  site: Site;
  outcome: 'recorded' | 'skipped';
  source: RecordingSource | null;
  skipReason: string | null;
  note: string | null;
  verdict: AnalysisResult['quality']['verdict'] | null;
  heartRateBpm: number | null;
  durationS: number | null;
  sampleRate: number | null;
  analysis: AnalysisResult | null;
  trace: DisplayTrace | null;
  /** Plain clip while the session is open; cleared once the session is sealed. */
  hasPlainClip: boolean;
  blobHash: string | null;
  sizeBytes: number | null;
  updatedAt: string;
};

export type { OutboxItem, OutboxState } from '@/shared/sync/storage';
import type { OutboxItem } from '@/shared/sync/storage';

export type OutboxRow = OutboxItem & {
  label: string | null;
  clientId: string | null;
  sessionId: string | null;
  /** Read from the client row at listing time, so an erased client's name leaves the outbox with the row. */
  clientName: string | null;
  site: Site | null;
};
