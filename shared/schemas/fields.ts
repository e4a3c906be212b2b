import { z } from 'zod';

/** E-mail addresses are compared and stored in lower case, without surrounding spaces. */
export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }));

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 128;

/** A new password: long enough to resist guessing, bounded so hashing stays cheap. */
export const newPasswordSchema = z
  .string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const personNameSchema = z
  .string({ error: 'Enter a name.' })
  .trim()
  .min(1, 'Enter a name.')
  .max(120, 'A name has at most 120 characters.');

/** A positive database id, also accepted as a numeric string (query strings, route params). */
export const idSchema = z.coerce
  .number({ error: 'Expected a number.' })
  .int('Expected a whole number.')
  .positive('Expected a positive id.');

/** Route parameters of a single-resource path such as /api/users/:id. */
export const idParamsSchema = z.strictObject({ id: idSchema });
