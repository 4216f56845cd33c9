import { z } from 'zod';
import {
  clientDetailsSchema,
  clientTableQuerySchema,
  eraseClientRequestSchema,
  updateClientRequestSchema,
} from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as records from '../use-cases/clients/client-records';
import { eraseClient } from '../use-cases/clients/erase-client';
import type { HandlerFactory } from './handlers';

export const idParam = z.object({ id: z.uuid({ error: 'Not a valid client id.' }) });

export const clientTable: HandlerFactory = (deps) => async (req, res) => {
  res.json(await records.listClientTable(deps, callerOf(req), clientTableQuerySchema.parse(req.query)));
};

export const clientRecord: HandlerFactory = (deps) => async (req, res) => {
  res.json(await records.getClientRecord(deps, callerOf(req), idParam.parse(req.params).id));
};

export const createClient: HandlerFactory = (deps) => async (req, res) => {
  res
    .status(201)
    .json(await records.createClientRecord(deps, callerOf(req), clientDetailsSchema.parse(req.body)));
};

export const updateClient: HandlerFactory = (deps) => async (req, res) => {
  const id = idParam.parse(req.params).id;
  await records.updateClientRecord(deps, callerOf(req), id, updateClientRequestSchema.parse(req.body));
  res.json(await records.getClientRecord(deps, callerOf(req), id));
};

export const erase: HandlerFactory = (deps) => async (req, res) => {
  const { confirmName } = eraseClientRequestSchema.parse(req.body);
  res.json(await eraseClient(deps, callerOf(req), idParam.parse(req.params).id, confirmName));
};
