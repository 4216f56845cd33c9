import { Op, Sequelize, type WhereOptions } from 'sequelize';
import type { ClientSummary } from '@/shared/protocol';
import { Client, Consent } from '../models';

const LIST_LIMIT = 200;
const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

export async function listClients(clinicId: string, q?: string): Promise<ClientSummary[]> {
  const where: WhereOptions = { clinicId };
  const search = q?.trim();
  if (search) {
    const pattern = `%${escapeLike(search)}%`;
    Object.assign(where, {
      [Op.or]: [
        { firstName: { [Op.iLike]: pattern } },
        { lastName: { [Op.iLike]: pattern } },
        { email: { [Op.iLike]: pattern } },
        Sequelize.where(
          Sequelize.fn('concat_ws', ' ', Sequelize.col('first_name'), Sequelize.col('last_name')),
          {
            [Op.iLike]: pattern,
          },
        ),
      ],
    });
  }
  const clients = await Client.findAll({
    where,
    include: [
      {
        model: Consent,
        as: 'consents',
        attributes: ['id', 'typedName', 'consentDate', 'consentTextVersion', 'version', 'createdAt'],
        required: false,
        where: { clinicId, deletedAt: null },
      },
    ],
    order: [
      ['lastName', 'ASC'],
      ['firstName', 'ASC'],
    ],
    limit: LIST_LIMIT,
    subQuery: true,
  });
  return clients.map((c) => {
    const consents = (c as Client & { consents?: Consent[] }).consents ?? [];
    const newest = consents.reduce<Consent | null>(
      (best, k) =>
        !best ||
        k.consentDate > best.consentDate ||
        (k.consentDate === best.consentDate && k.createdAt > best.createdAt)
          ? k
          : best,
      null,
    );
    return {
      id: c.id,
      firstName: c.firstName,
      lastName: c.lastName,
      dateOfBirth: c.dateOfBirth ?? null,
      email: c.email ?? null,
      hasConsent: consents.length > 0,
      consent: newest
        ? {
            id: newest.id,
            signedName: newest.typedName,
            signedOn: String(newest.consentDate).slice(0, 10),
            textVersion: newest.consentTextVersion,
            version: newest.version,
          }
        : null,
      updatedAt: c.updatedAt.toISOString(),
    };
  });
}
