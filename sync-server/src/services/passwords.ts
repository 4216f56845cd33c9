import bcrypt from 'bcryptjs';

const COST = 10;
// Compared against when the e-mail is unknown, so both answers take as long as each other.
const DUMMY_HASH = bcrypt.hashSync('fourpoint-no-such-user', COST);

export const hashPassword = (password: string) => bcrypt.hash(password, COST);

export async function verifyPassword(password: string, hash: string | undefined): Promise<boolean> {
  const ok = await bcrypt.compare(password, hash ?? DUMMY_HASH);
  return ok && hash !== undefined;
}
