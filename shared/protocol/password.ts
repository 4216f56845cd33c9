import { z } from 'zod';

/**
 * The rule for a new password, shared by the forms and the server (OWASP ASVS 4.0.3 V2.1.1, V2.1.2, V2.1.7).
 * The app checks length and the e-mail; the server also refuses common and easily guessed passwords with
 * zxcvbn-ts, whose dictionaries (several MB) are too heavy for the phone's bundle.
 */
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 200;

// Counted in characters a person typed (code points), not UTF-16 units, so an emoji counts once.
const characters = (password: string) => Array.from(password).length;

export const newPasswordSchema = z
  .string()
  .refine((p) => characters(p) >= PASSWORD_MIN_LENGTH, {
    error: `Use at least ${PASSWORD_MIN_LENGTH} characters. A few unrelated words make a long password easy to remember.`,
  })
  .refine((p) => characters(p) <= PASSWORD_MAX_LENGTH, {
    error: `The password is at most ${PASSWORD_MAX_LENGTH} characters.`,
  });

export const PASSWORD_HAS_EMAIL_MESSAGE =
  'Do not use your e-mail address, or the part before the @, in your password.';

/** True when the password is, or contains, the e-mail address or its local part (case ignored). */
export function passwordContainsEmail(password: string, email: string): boolean {
  const pass = password.toLowerCase();
  const address = email.trim().toLowerCase();
  const local = address.split('@')[0] ?? '';
  // A one- or two-letter local part would refuse half the dictionary; zxcvbn still sees it as user input.
  return (address !== '' && pass.includes(address)) || (local.length >= 3 && pass.includes(local));
}

/** The length rule plus the e-mail rule, for a form that knows whose password it is. */
export const newPasswordSchemaFor = (email: string) =>
  newPasswordSchema.refine((p) => !passwordContainsEmail(p, email), { error: PASSWORD_HAS_EMAIL_MESSAGE });
