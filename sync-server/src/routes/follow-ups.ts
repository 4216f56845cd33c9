import { followUpsDueQuerySchema } from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as followUps from '../use-cases/follow-ups/follow-ups';
import type { HandlerFactory } from './handlers';

export const followUpsDue: HandlerFactory = (deps) => async (req, res) => {
  const { withinDays } = followUpsDueQuerySchema.parse(req.query);
  res.json({ due: await followUps.listFollowUpsDue(deps, callerOf(req), withinDays) });
};

export const runReminders: HandlerFactory = (deps) => async (req, res) => {
  res.json(await followUps.runRemindersNow(deps, callerOf(req)));
};
