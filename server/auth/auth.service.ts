import { createSecretKey } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { AuditService } from '../audit/audit.service.ts';
import type { Config } from '../config.ts';
import type { Database } from '../db.ts';
import { AppError } from '../lib/app-error.ts';
import { fromStoredDate } from '../lib/stored-date.ts';
import type { InferAttributes } from 'sequelize';
import { User } from '../users/user.model.ts';
import type { Role } from './permissions.ts';
import { normaliseEmail } from '../users/users.service.ts';
import { checkPassword, dummyHash } from './passwords.ts';

interface TokenClaims {
  sub: string;
  /** The account's token version when the token was issued. */
  tv: number;
}

interface UserRow {
  id: number;
  email: string;
  name: string;
  passwordHash: string;
  role: Role;
  disabled: number | boolean;
  tokenVersion: number;
  createdAt: string;
  updatedAt: string;
}

const unauthenticated = (message: string) => new AppError(401, 'unauthenticated', message);

export function createAuthService({ db, audit, config }: { db: Database; audit: AuditService; config: Config }) {
  // A KeyObject made once: given a string, jsonwebtoken tries it as a PEM public key (and fails)
  // on every call before it treats it as an HMAC secret.
  const key = createSecretKey(Buffer.from(config.jwtSecret, 'utf8'));
  const issueToken = (user: User) =>
    jwt.sign({ tv: user.tokenVersion } satisfies Omit<TokenClaims, 'sub'>, key, { algorithm: 'HS256', expiresIn: config.jwtTtlS, subject: String(user.id) });

  /**
   * The same 401 for an unknown address, a wrong password and a disabled account, after the
   * same bcrypt work; the change log records which it was.
   */
  async function login(emailInput: string, password: string): Promise<{ token: string; user: User }> {
    const email = normaliseEmail(emailInput);
    const user = await User.findOne({ where: { email } });
    const matches = await checkPassword(password, user?.passwordHash ?? (await dummyHash()));
    if (!user || !matches || user.disabled) {
      const reason = !user ? 'unknown-account' : !matches ? 'wrong-password' : 'account-disabled';
      await db.write((t) =>
        audit.append(t, { action: 'auth.login-failed', actor: user ? { id: user.id, email: user.email } : null, actorEmail: email.slice(0, 254), details: { reason } }),
      );
      throw new AppError(401, 'invalid-credentials', 'the e-mail address or the password is not right');
    }
    await db.write((t) => audit.append(t, { action: 'auth.login', actor: { id: user.id, email: user.email } }));
    return { token: issueToken(user), user };
  }

  /**
   * One account by id, read afresh with one plain SELECT (every request does this), with the
   * data_version it was read at: a route may check its cached answer against it.
   */
  async function findUser(id: number): Promise<{ user: User | null; dataVersion: number }> {
    const { row, dataVersion } = await db.getAtVersion<UserRow>(
      'SELECT id, email, name, password_hash AS passwordHash, role, disabled, token_version AS tokenVersion, created_at AS createdAt, updated_at AS updatedAt FROM users WHERE id = ?',
      [id],
    );
    if (!row) return { user: null, dataVersion };
    // Typed as Sequelize would: booleans from 0/1, dates from the stored text.
    const user = User.build(
      { ...row, disabled: Boolean(row.disabled), createdAt: fromStoredDate(row.createdAt), updatedAt: fromStoredDate(row.updatedAt) } as InferAttributes<User>,
      { isNewRecord: false, raw: true },
    );
    return { user, dataVersion };
  }

  /**
   * The account behind a bearer token, read afresh so a disable or a role change counts at once,
   * and the data_version of that read.
   */
  async function authenticate(header: string | undefined): Promise<{ user: User; dataVersion: number }> {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(header ?? '');
    if (!match) throw unauthenticated('sign in first: this needs an Authorization: Bearer <token> header');
    let claims: TokenClaims;
    try {
      claims = jwt.verify(match[1], key, { algorithms: ['HS256'] }) as unknown as TokenClaims;
    } catch (err) {
      throw unauthenticated(err instanceof jwt.TokenExpiredError ? 'the session has expired: sign in again' : 'the token is not valid: sign in again');
    }
    const id = Number(claims.sub);
    const found = Number.isSafeInteger(id) ? await findUser(id) : null;
    const user = found?.user;
    if (!user || user.disabled || user.tokenVersion !== claims.tv) throw unauthenticated('the session is no longer valid: sign in again');
    return { user, dataVersion: found.dataVersion };
  }

  return { login, authenticate, issueToken };
}

export type AuthService = ReturnType<typeof createAuthService>;
