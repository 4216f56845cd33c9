import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';
import * as en from '@zxcvbn-ts/language-en';
import { newPasswordSchema, PASSWORD_HAS_EMAIL_MESSAGE, passwordContainsEmail } from '@/shared/protocol';
import { AppError } from '../errors';

/**
 * zxcvbn scores 0–4; 3 is "safely unguessable: moderate protection from offline slow-hash scenario"
 * (fewer than 10^10 guesses is a 2), per zxcvbn's documented score scale. Below 3 is refused.
 */
export const MIN_ZXCVBN_SCORE = 3;

// Words of this service that an attacker would try first, beside the person's own e-mail.
const SERVICE_WORDS = ['fourpoint', 'four point', 'heart', 'stethoscope', 'clinic'];

let zxcvbn: ZxcvbnFactory | undefined;
const estimator = () =>
  (zxcvbn ??= new ZxcvbnFactory({
    dictionary: { ...common.dictionary, ...en.dictionary },
    graphs: common.adjacencyGraphs,
    translations: en.translations,
  }));

const weak = (message: string) => new AppError('weak_password', message, 400);

/** Throws a 400 that says what to change when the password does not meet the rule for a new password. */
export function assertAcceptablePassword(password: string, email: string): void {
  const length = newPasswordSchema.safeParse(password);
  if (!length.success) throw weak(length.error.issues[0].message);
  if (passwordContainsEmail(password, email)) throw weak(PASSWORD_HAS_EMAIL_MESSAGE);
  const local = email.split('@')[0] ?? '';
  const result = estimator().check(password, [email, local, ...local.split(/[._+-]/), ...SERVICE_WORDS]);
  if (result.score >= MIN_ZXCVBN_SCORE) return;
  const why = result.feedback.warning ? ` ${result.feedback.warning}` : '';
  throw weak(
    `This password is too easy to guess.${why} Use three or four unrelated words, or a longer phrase only you would think of.`,
  );
}
