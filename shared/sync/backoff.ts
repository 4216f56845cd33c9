export interface BackoffPolicy {
  baseMs: number;
  maxMs: number;
}

export const defaultBackoff: BackoffPolicy = { baseMs: 2_000, maxMs: 5 * 60_000 };

/**
 * Exponential backoff with "equal jitter": half the capped exponential delay is fixed, half random, so retries
 * from many devices spread out but none comes back immediately.
 */
export function backoffDelay(
  attempts: number,
  policy: BackoffPolicy = defaultBackoff,
  random: () => number = Math.random,
): number {
  const exponent = Math.max(0, attempts - 1);
  const capped = Math.min(policy.maxMs, policy.baseMs * 2 ** Math.min(exponent, 30));
  return Math.round(capped / 2 + random() * (capped / 2));
}
