import type { RequestHandler } from 'express';
import {
  clientListQuerySchema,
  refreshRequestSchema,
  signInRequestSchema,
  signOutRequestSchema,
  type ClientListResponse,
  type LivenessResponse,
  type MeResponse,
  type SessionListResponse,
} from '@/shared/protocol';
import { AppError } from '../errors';
import { callerOf } from '../middleware/authenticate';
import { getMe, refreshSession, signIn, signOut } from '../use-cases/auth';
import type { UseCaseDeps } from '../use-cases/context';
import { checkHealth, checkReadiness } from '../use-cases/health';
import { findClients, findSessions } from '../use-cases/lists';
import { clearRefreshCookie, refreshTokenOf, sendTokens } from './refresh-cookie';

export type HandlerFactory = (deps: UseCaseDeps) => RequestHandler;

export const health: HandlerFactory = (deps) => async (_req, res) => {
  const result = await checkHealth(deps.sequelize);
  res.status(result.ok ? 200 : 503).json(result);
};

/** Liveness: this process answers (no dependency is asked, so a database outage never restarts instances). */
export const healthLive: HandlerFactory = () => (_req, res) => {
  const body: LivenessResponse = { ok: true };
  res.json(body);
};

/** Readiness: the load balancer sends requests here only while this answers 200. */
export const healthReady: HandlerFactory = (deps) => async (_req, res) => {
  const result = await checkReadiness(deps.services.readiness);
  res.status(result.ok ? 200 : 503).json(result);
};

export const signInHandler: HandlerFactory = (deps) => async (req, res) => {
  const input = signInRequestSchema.parse(req.body);
  const tokens = await signIn(deps, input, req.ip ?? null);
  sendTokens(req, res, tokens, input.refreshTokenIn === 'cookie');
};

export const refreshHandler: HandlerFactory = (deps) => async (req, res) => {
  const given = refreshTokenOf(req, refreshRequestSchema.parse(req.body ?? {}).refreshToken);
  if (!given) throw new AppError('refresh_token_missing', 'No refresh token was sent. Sign in again.', 400);
  try {
    sendTokens(req, res, await refreshSession(deps, given.token, req.ip ?? null), given.via === 'cookie');
  } catch (error) {
    // A cookie that no longer refreshes is dropped, so the browser stops sending it.
    if (given.via === 'cookie') clearRefreshCookie(req, res);
    throw error;
  }
};

export const signOutHandler: HandlerFactory = (deps) => async (req, res) => {
  const given = refreshTokenOf(req, signOutRequestSchema.parse(req.body ?? {}).refreshToken);
  if (given) await signOut(deps, given.token, req.ip ?? null);
  clearRefreshCookie(req, res);
  res.status(204).end();
};

export const me: HandlerFactory = (deps) => async (req, res) => {
  const caller = callerOf(req);
  const body: MeResponse = { user: await getMe(deps, caller.clinicId, caller.userId) };
  res.json(body);
};

export const clients: HandlerFactory = (deps) => async (req, res) => {
  const { q } = clientListQuerySchema.parse(req.query);
  const body: ClientListResponse = { clients: await findClients(deps, callerOf(req), q) };
  res.json(body);
};

export const sessions: HandlerFactory = (deps) => async (req, res) => {
  const body: SessionListResponse = { sessions: await findSessions(deps, callerOf(req)) };
  res.json(body);
};
