import type { Href } from 'expo-router';

/**
 * Where a practitioner's Back goes: the screen they came from, carried in the link as `from` (so a reload keeps
 * it), not the last tab. `from` is "follow-ups", "clients", "client" or "session:<id>".
 */
export function backTarget(
  from: string | undefined,
  clientId: string,
  fallback: 'clients' | 'client',
): { label: string; href: Href } {
  const session = /^session:([0-9a-f-]{36})$/.exec(from ?? '');
  if (session) return { label: '← Back to the visit', href: `/sessions/${session[1]}` };
  if (from === 'follow-ups') return { label: '← Follow-ups due', href: '/follow-ups' };
  if (from === 'client' || (from !== 'clients' && fallback === 'client'))
    return { label: '← All visits of this client', href: `/review-clients/${clientId}` };
  return { label: '← Clients', href: '/review-clients' };
}
