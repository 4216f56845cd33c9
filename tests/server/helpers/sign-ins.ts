import { execute } from '@/sync-server/src/repositories/sql';
import { hashRefreshToken } from '@/sync-server/src/services/tokens';
import { REUSE_GRACE_MS } from '@/sync-server/src/use-cases/auth';
import { testDatabase } from './test-app';

/** Moves a spent refresh token's rotation past the reuse window (REUSE_GRACE_MS), so using it again is a replay. */
export async function rotatedLongAgo(refreshToken: string): Promise<void> {
  await execute(
    testDatabase(),
    `UPDATE refresh_tokens SET revoked_at = :revokedAt WHERE token_hash = :tokenHash`,
    {
      revokedAt: new Date(Date.now() - 2 * REUSE_GRACE_MS),
      tokenHash: hashRefreshToken(refreshToken),
    },
  );
}
