import { hash, verify } from '@node-rs/argon2';
import { dictionary } from '@zxcvbn-ts/language-common';
import { badRequest } from '../errors';

// The common-password list is zxcvbn-ts's "passwords-common" frequency list (the most used
// passwords from published breach corpora), shipped with @zxcvbn-ts/language-common.
let common: Set<string> | undefined;
const commonPasswords = () =>
  (common ??= new Set((dictionary['passwords-common'] as string[]).map((p) => p.toLowerCase())));

/** True for a password on the list, compared without case. */
export function isCommonPassword(password: string): boolean {
  return commonPasswords().has(password.toLowerCase());
}

/** Refuses a listed password with a field error under `field`; the length is the schema's. */
export function assertUncommon(password: string, field: string): void {
  if (isCommonPassword(password))
    throw badRequest('Some body fields are not valid.', [
      { field, message: 'This password is on a list of common passwords: choose another' },
    ]);
}

/** argon2id with the library's defaults, as the sign-in check and the seed use. */
export const hashPassword = (password: string) => hash(password);

export const passwordMatches = (stored: string | null, password: string) =>
  stored ? verify(stored, password).catch(() => false) : Promise.resolve(false);
