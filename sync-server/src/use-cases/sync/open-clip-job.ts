import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { openClip, SealError } from '@/shared/seal';
import type { ClipAnalysis, StoredTrace } from '@/shared/protocol/analysis';
import { analyseClip } from './analyse-clip';

export interface OpenClipJob {
  /** The staged upload, read here rather than sent over: the request thread never holds the clip. */
  file: string;
  declaredSha256: string;
  clinicPrivateKey: Uint8Array;
}

export type OpenClipResult =
  | { state: 'hash_mismatch'; sha256: string; sizeBytes: number }
  | { state: 'unreadable'; sha256: string; sizeBytes: number; failure: string }
  | { state: 'opened'; sha256: string; sizeBytes: number; analysis: ClipAnalysis; trace: StoredTrace | null };

/** Reads the file piece by piece into one buffer, hashing as it goes. */
async function readHashed(file: string): Promise<{ bytes: Uint8Array; sha256: string }> {
  const { size } = await fs.promises.stat(file);
  const bytes = new Uint8Array(size);
  const hash = createHash('sha256');
  let at = 0;
  for await (const piece of fs.createReadStream(file, {
    highWaterMark: 1024 * 1024,
  }) as AsyncIterable<Buffer>) {
    if (at + piece.length > size) throw new Error(`The staged clip ${file} grew while it was read.`);
    bytes.set(piece, at);
    hash.update(piece);
    at += piece.length;
  }
  if (at !== size) throw new Error(`The staged clip ${file} shrank while it was read.`);
  return { bytes, sha256: hash.digest('hex') };
}

/**
 * Checks a staged upload against its hash, opens the seal and runs the server's analysis (the one of record) and
 * draws its display trace.
 * Runs in the clip worker thread: opening and analysing a long clip takes seconds of CPU.
 */
export async function openStagedClip(job: OpenClipJob): Promise<OpenClipResult> {
  const { bytes, sha256 } = await readHashed(job.file);
  const sizeBytes = bytes.byteLength;
  if (sha256 !== job.declaredSha256) return { state: 'hash_mismatch', sha256, sizeBytes };
  let plain: Uint8Array;
  try {
    plain = openClip(bytes, job.clinicPrivateKey);
  } catch (error) {
    if (!(error instanceof SealError)) throw error;
    return { state: 'unreadable', sha256, sizeBytes, failure: error.message };
  }
  return { state: 'opened', sha256, sizeBytes, ...analyseClip(plain) };
}
