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
import { rowId } from './row-ids';

export const clientTable: HandlerFactory = (deps) => async (req, res) => {
  res.json(await records.listClientTable(deps, callerOf(req), clientTableQuerySchema.parse(req.query)));
};

export const clientRecord: HandlerFactory = (deps) => async (req, res) => {
  res.json(await records.getClientRecord(deps, callerOf(req), rowId(req)));
};

export const createClient: HandlerFactory = (deps) => async (req, res) => {
  res
    .status(201)
    .json(await records.createClientRecord(deps, callerOf(req), clientDetailsSchema.parse(req.body)));
};

export const updateClient: HandlerFactory = (deps) => async (req, res) => {
  const id = rowId(req);
  await records.updateClientRecord(deps, callerOf(req), id, updateClientRequestSchema.parse(req.body));
  res.json(await records.getClientRecord(deps, callerOf(req), id));
};

export const erase: HandlerFactory = (deps) => async (req, res) => {
  const { confirmName } = eraseClientRequestSchema.parse(req.body);
  res.json(await eraseClient(deps, callerOf(req), rowId(req), confirmName));
};
