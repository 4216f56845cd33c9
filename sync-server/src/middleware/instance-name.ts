import type { RequestHandler } from 'express';

/**
 * Names the server process on every API answer (`X-Fourpoint-Instance`), so an operator behind the load balancer
 * can tell which instance served a request when reading logs or chasing a fault. The name is configuration
 * (FOURPOINT_INSTANCE), never a secret: it says which process, not where it runs.
 */
export function instanceName(name: string): RequestHandler {
  return (_req, res, next) => {
    res.setHeader('X-Fourpoint-Instance', name);
    next();
  };
}
