import type { RequestHandler } from 'express';
import {
  clientListQuerySchema,
  refreshRequestSchema,
  signInRequestSchema,
  type ClientListResponse,
  type MeResponse,
  type SessionListResponse,
  type SignInResponse,
  type UserListResponse,
} from '@/shared/protocol';
import { callerOf } from '../middleware/authenticate';
import { getMe, refreshSession, signIn, signOut } from '../use-cases/auth';
import type { UseCaseDeps } from '../use-cases/context';
import { checkHealth } from '../use-cases/health';
import { findClients, findSessions, findTeam } from '../use-cases/lists';

export type HandlerFactory = (deps: UseCaseDeps) => RequestHandler;

export const health: HandlerFactory = (deps) => async (_req, res) => {
  const result = await checkHealth(deps.sequelize);
  res.status(result.ok ? 200 : 503).json(result);
};

export const signInHandler: HandlerFactory = (deps) => async (req, res) => {
  const body: SignInResponse = await signIn(deps, signInRequestSchema.parse(req.body), req.ip ?? null);
  res.json(body);
};

export const refreshHandler: HandlerFactory = (deps) => async (req, res) => {
  const body: SignInResponse = await refreshSession(
    deps,
    refreshRequestSchema.parse(req.body),
    req.ip ?? null,
  );
  res.json(body);
};

export const signOutHandler: HandlerFactory = (deps) => async (req, res) => {
  await signOut(deps, refreshRequestSchema.parse(req.body), req.ip ?? null);
  res.status(204).end();
};

export const me: HandlerFactory = () => async (req, res) => {
  const caller = callerOf(req);
  const body: MeResponse = { user: await getMe(caller.clinicId, caller.userId) };
  res.json(body);
};

export const clients: HandlerFactory = () => async (req, res) => {
  const { q } = clientListQuerySchema.parse(req.query);
  const body: ClientListResponse = { clients: await findClients(callerOf(req), q) };
  res.json(body);
};

export const sessions: HandlerFactory = () => async (req, res) => {
  const body: SessionListResponse = { sessions: await findSessions(callerOf(req)) };
  res.json(body);
};

export const users: HandlerFactory = () => async (req, res) => {
  const body: UserListResponse = { users: await findTeam(callerOf(req)) };
  res.json(body);
};
