import { callerOf } from '../middleware/authenticate';
import { attention } from '../use-cases/overview/attention';
import type { HandlerFactory } from './handlers';

export const attentionCounts: HandlerFactory = (deps) => async (req, res) => {
  res.json(await attention(deps, callerOf(req)));
};
