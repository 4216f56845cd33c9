import type { EraseClientResponse } from '@/shared/protocol/practice';

/** "1 visit", "6 visits": a count with its noun, the way a result of an action is told. */
export function countOf(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** "a, b and c" */
export function listWords(parts: readonly string[]): string {
  if (parts.length <= 1) return parts[0] ?? '';
  return `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
}

export type ErasedCounts = EraseClientResponse['erased'];

/** "6 visits, 24 recordings, 1 signed consent and 3 report e-mails"; kinds with none are left out. */
export function erasedCountsWords(c: ErasedCounts): string {
  const parts = [
    c.visits ? countOf(c.visits, 'visit') : null,
    c.recordings ? countOf(c.recordings, 'recording') : null,
    c.consents ? countOf(c.consents, 'signed consent') : null,
    c.reportEmails ? countOf(c.reportEmails, 'report e-mail') : null,
  ].filter((p): p is string => p !== null);
  return parts.length ? listWords(parts) : 'the record only (no visits yet)';
}
