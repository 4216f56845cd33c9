import { z } from 'zod';
import { clinicSettingsSchema, rangeSiteSchema, setRangeRequestSchema } from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as settings from '../use-cases/settings/settings';
import type { HandlerFactory } from './handlers';

const rangeParams = z.object({ metric: z.string().regex(/^[A-Za-z0-9_.-]{1,60}$/), site: rangeSiteSchema });

export const getSettings: HandlerFactory = (deps) => async (req, res) => {
  res.json(await settings.getSettings(deps, callerOf(req).clinicId));
};

export const saveSettings: HandlerFactory = (deps) => async (req, res) => {
  res.json(await settings.saveSettings(deps, callerOf(req), clinicSettingsSchema.parse(req.body)));
};

export const getRanges: HandlerFactory = (deps) => async (req, res) => {
  res.json({ ranges: await settings.getRanges(deps, callerOf(req).clinicId) });
};

export const setRange: HandlerFactory = (deps) => async (req, res) => {
  const { metric, site } = rangeParams.parse(req.params);
  res.json({
    ranges: await settings.setRange(deps, callerOf(req), metric, site, setRangeRequestSchema.parse(req.body)),
  });
};

export const resetRange: HandlerFactory = (deps) => async (req, res) => {
  const { metric, site } = rangeParams.parse(req.params);
  res.json({ ranges: await settings.resetRanges(deps, callerOf(req), { metric, site }) });
};

export const resetAllRanges: HandlerFactory = (deps) => async (req, res) => {
  res.json({ ranges: await settings.resetRanges(deps, callerOf(req), null) });
};
