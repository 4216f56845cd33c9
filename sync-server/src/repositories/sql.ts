import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

/** Plain rows from one parameterised statement; the practice's repositories are written as SQL. */
export async function selectRows<T extends object>(
  sequelize: Sequelize,
  sql: string,
  replacements: Record<string, unknown> = {},
  transaction?: Transaction,
): Promise<T[]> {
  return sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction });
}

export async function execute(
  sequelize: Sequelize,
  sql: string,
  replacements: Record<string, unknown> = {},
  transaction?: Transaction,
): Promise<number> {
  const [, meta] = await sequelize.query(sql, { replacements, transaction });
  return (meta as { rowCount?: number } | undefined)?.rowCount ?? 0;
}

export const iso = (value: Date | string | null | undefined): string | null =>
  value === null || value === undefined ? null : new Date(value).toISOString();

export const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);
