import { z } from 'zod';
import {
  acceptInvitationRequestSchema,
  inviteRequestSchema,
  updateTeamUserRequestSchema,
} from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as team from '../use-cases/team/team';
import type { HandlerFactory } from './handlers';
import { ipOf, linkBase } from './request-origin';
import { rowId } from './row-ids';

const tokenParam = z.object({ token: z.string().min(10).max(600) });

export const listTeam: HandlerFactory = (deps) => async (req, res) => {
  res.json(await team.getTeam(deps, callerOf(req)));
};

export const invite: HandlerFactory = (deps) => async (req, res) => {
  res
    .status(201)
    .json(
      await team.inviteUser(
        deps,
        callerOf(req),
        inviteRequestSchema.parse(req.body),
        linkBase(deps.services, req),
      ),
    );
};

export const revokeInvitation: HandlerFactory = (deps) => async (req, res) => {
  await team.withdrawInvitation(deps, callerOf(req), rowId(req));
  res.status(204).end();
};

export const updateUser: HandlerFactory = (deps) => async (req, res) => {
  res.json({
    user: await team.changeTeamUser(
      deps,
      callerOf(req),
      rowId(req),
      updateTeamUserRequestSchema.parse(req.body),
    ),
  });
};

export const previewInvitation: HandlerFactory = (deps) => async (req, res) => {
  res.json(await team.previewInvitation(deps, tokenParam.parse(req.params).token));
};

export const acceptInvitation: HandlerFactory = (deps) => async (req, res) => {
  const token = tokenParam.parse(req.params).token;
  res
    .status(201)
    .json(await team.acceptInvitation(deps, token, acceptInvitationRequestSchema.parse(req.body), ipOf(req)));
};
