import bcrypt from 'bcryptjs';

/** bcrypt work factor: OWASP Password Storage Cheat Sheet asks for 10 or more. */
export const BCRYPT_COST = 10;
/** bcrypt reads at most 72 bytes of the password; longer ones are refused rather than cut. */
export const MAX_PASSWORD_BYTES = 72;
export const MIN_PASSWORD_LENGTH = 8;

export const hashPassword = (password: string) => bcrypt.hash(password, BCRYPT_COST);
export const checkPassword = (password: string, hash: string) => bcrypt.compare(password, hash);

let dummy: Promise<string> | null = null;
/** A hash to compare against when the account does not exist, so both cases take as long. */
export const dummyHash = () => (dummy ??= bcrypt.hash('no account has this password', BCRYPT_COST));

export function passwordProblem(password: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) return `the password must be at least ${MIN_PASSWORD_LENGTH} characters long`;
  if (Buffer.byteLength(password, 'utf8') > MAX_PASSWORD_BYTES) return `the password may be at most ${MAX_PASSWORD_BYTES} bytes long`;
  return null;
}
