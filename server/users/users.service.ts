import { UniqueConstraintError } from 'sequelize';
import type { AuditService } from '../audit/audit.service.ts';
import { checkPassword, hashPassword, passwordProblem } from '../auth/passwords.ts';
import type { Role } from '../auth/permissions.ts';
import type { Database } from '../db.ts';
import { AppError, notFound } from '../lib/app-error.ts';
import { User } from './user.model.ts';

export const normaliseEmail = (email: string) => email.trim().toLowerCase();
const actorOf = (u: User) => ({ id: u.id, email: u.email });

function assertPassword(password: string) {
  const problem = passwordProblem(password);
  if (problem) throw new AppError(400, 'weak-password', problem);
}

export interface NewUser {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export interface UserPatch {
  role?: Role;
  disabled?: boolean;
  name?: string;
}

export function createUsersService({ db, audit, now }: { db: Database; audit: AuditService; now: () => Date }) {
  const list = () => User.findAll({ order: [['id', 'ASC']] });

  /** `actor` null: created by the seed, not by a person. */
  async function create(input: NewUser, actor: User | null): Promise<User> {
    assertPassword(input.password);
    const email = normaliseEmail(input.email);
    // bcrypt is slow on purpose: hash before taking the write lock.
    const passwordHash = await hashPassword(input.password);
    try {
      return await db.write(async (t) => {
        if (await User.findOne({ where: { email }, transaction: t })) throw new AppError(409, 'email-taken', `an account for ${email} already exists`);
        const at = now();
        const user = await User.create({ email, name: input.name.trim(), role: input.role, passwordHash, createdAt: at, updatedAt: at }, { transaction: t });
        await audit.append(t, { action: 'user.created', actor: actor && actorOf(actor), details: { userId: user.id, email, name: user.name, role: user.role } });
        return user;
      });
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw new AppError(409, 'email-taken', `an account for ${email} already exists`);
      throw err;
    }
  }

  async function update(id: number, patch: UserPatch, actor: User): Promise<User> {
    return db.write(async (t) => {
      const user = await User.findByPk(id, { transaction: t });
      if (!user) throw notFound('the account');
      const changes: Record<string, { from: unknown; to: unknown }> = {};
      if (patch.name !== undefined && patch.name.trim() !== user.name) changes.name = { from: user.name, to: patch.name.trim() };
      if (patch.role !== undefined && patch.role !== user.role) changes.role = { from: user.role, to: patch.role };
      if (patch.disabled !== undefined && patch.disabled !== user.disabled) changes.disabled = { from: user.disabled, to: patch.disabled };
      if (Object.keys(changes).length === 0) return user;

      // Someone must still be able to manage accounts afterwards.
      const losesAdmin = user.role === 'admin' && !user.disabled && (changes.role || changes.disabled?.to === true);
      if (losesAdmin) {
        const admins = await User.count({ where: { role: 'admin', disabled: false }, transaction: t });
        if (admins <= 1) throw new AppError(409, 'last-admin', 'this is the last active admin account: make another admin first');
      }
      if (changes.name) user.name = changes.name.to as string;
      if (changes.role) user.role = changes.role.to as Role;
      if (changes.disabled) {
        user.disabled = changes.disabled.to as boolean;
        if (user.disabled) user.tokenVersion += 1;
      }
      user.updatedAt = now();
      await user.save({ transaction: t });
      await audit.append(t, { action: 'user.updated', actor: actorOf(actor), details: { userId: user.id, email: user.email, changes } });
      return user;
    });
  }

  async function writePassword(id: number, password: string, actor: User, by: 'self' | 'admin'): Promise<User> {
    assertPassword(password);
    const passwordHash = await hashPassword(password);
    return db.write(async (t) => {
      const user = await User.findByPk(id, { transaction: t });
      if (!user) throw notFound('the account');
      user.passwordHash = passwordHash;
      // Tokens issued before the change stop working.
      user.tokenVersion += 1;
      user.updatedAt = now();
      await user.save({ transaction: t });
      await audit.append(t, { action: 'user.password-changed', actor: actorOf(actor), details: { userId: user.id, email: user.email, by } });
      return user;
    });
  }

  const setPassword = (id: number, password: string, actor: User) => writePassword(id, password, actor, 'admin');

  async function changeOwnPassword(user: User, currentPassword: string, newPassword: string): Promise<User> {
    if (!(await checkPassword(currentPassword, user.passwordHash))) throw new AppError(403, 'wrong-password', 'the current password is not right');
    return writePassword(user.id, newPassword, user, 'self');
  }

  return { list, create, update, setPassword, changeOwnPassword };
}

export type UsersService = ReturnType<typeof createUsersService>;
