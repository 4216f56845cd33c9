import { callerOf } from '../middleware/authenticate';
import * as records from '../repositories/clients-repository';
import { clientNotFound } from '../use-cases/clients/client-records';
import { exportClient } from '../use-cases/export/export-client';
import type { HandlerFactory } from './handlers';
import { rowId } from './row-ids';

export const exportZip: HandlerFactory = (deps) => async (req, res) => {
  const caller = callerOf(req);
  const id = rowId(req);
  // Checked before the headers go out, so an unknown client is a plain JSON 404 and not a broken zip.
  const client = await records.findClientRow(deps.sequelize, caller.clinicId, id);
  if (!client) throw clientNotFound();
  const name = `${client.last_name}-${client.first_name}`.toLowerCase().replace(/[^a-z0-9-]+/g, '-');
  res.setHeader('Content-Type', 'application/zip');
  res.setHeader(
    'Content-Disposition',
    `attachment; filename="fourpoint-export-${name}-${new Date().toISOString().slice(0, 10)}.zip"`,
  );
  res.setHeader('Cache-Control', 'no-store');
  await exportClient(deps, caller, id, res);
};
