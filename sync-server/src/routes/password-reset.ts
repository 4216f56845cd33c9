import { z } from 'zod';
import { completePasswordResetRequestSchema, passwordResetRequestSchema } from '@/shared/protocol';
import * as passwordReset from '../use-cases/password-reset';
import type { HandlerFactory } from './handlers';
import { ipOf, linkBase } from './request-origin';

const tokenParam = z.object({ token: z.string().min(10).max(600) });

export const requestPasswordReset: HandlerFactory = (deps) => async (req, res) => {
  const { email } = passwordResetRequestSchema.parse(req.body);
  res
    .status(202)
    .json(await passwordReset.requestPasswordReset(deps, email, linkBase(deps.services, req), ipOf(req)));
};

export const previewPasswordReset: HandlerFactory = (deps) => async (req, res) => {
  res.json(await passwordReset.previewPasswordReset(deps, tokenParam.parse(req.params).token));
};

export const completePasswordReset: HandlerFactory = (deps) => async (req, res) => {
  const token = tokenParam.parse(req.params).token;
  const { password } = completePasswordResetRequestSchema.parse(req.body);
  res.json(await passwordReset.completePasswordReset(deps, token, password, ipOf(req)));
};
