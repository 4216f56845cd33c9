import { publishConsentTextRequestSchema } from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as texts from '../use-cases/clients/consent-texts';
import type { HandlerFactory } from './handlers';

export const listConsentTexts: HandlerFactory = (deps) => async (req, res) => {
  res.json({ texts: await texts.listConsentTexts(deps, callerOf(req)) });
};

export const publishConsentText: HandlerFactory = (deps) => async (req, res) => {
  res.status(201).json({
    text: await texts.publishConsentText(
      deps,
      callerOf(req),
      publishConsentTextRequestSchema.parse(req.body),
    ),
  });
};
