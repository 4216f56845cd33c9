import type { RequestHandler } from 'express';
import { AppError } from '../errors';

// PostgreSQL text cannot hold U+0000, and a NUL cuts strings short in C-based tools downstream (PDF, mail):
// one check here covers every text field of every body and query, instead of one per schema.
const NUL = '\u0000';

function findNul(value: unknown, path: string, depth = 0): string | undefined {
  if (typeof value === 'string') return value.includes(NUL) ? path : undefined;
  if (typeof value !== 'object' || value === null || depth > 64) return undefined;
  for (const [key, inner] of Object.entries(value)) {
    const at = path ? `${path}.${key}` : key;
    if (key.includes(NUL)) return at;
    const found = findNul(inner, at, depth + 1);
    if (found) return found;
  }
  return undefined;
}

/** Refuses a request whose JSON body or query string carries a NUL character anywhere, naming where. */
export const refuseNulCharacters: RequestHandler = (req, _res, next) => {
  const where = findNul(req.body, 'body') ?? findNul(req.query, 'query');
  if (where) {
    throw new AppError(
      'nul_character',
      `The text in ${where.replaceAll(NUL, '\\0')} contains a NUL character (\\0), which cannot be stored. Remove it and send again.`,
      400,
    );
  }
  next();
};
