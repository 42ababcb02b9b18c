import type { JSONSchemaType } from 'ajv';
import { Router } from 'express';
import { ROLES } from '../auth/permissions.ts';
import type { MountRoute } from '../lib/route.ts';
import { EMAIL_PATTERN, bodyChecker, idParam } from '../lib/validate.ts';
import { currentUser } from '../middleware/authorize.ts';
import { requireJson } from '../middleware/error-handler.ts';
import { toPublicUser } from './user.model.ts';
import type { NewUser, UserPatch, UsersService } from './users.service.ts';

const name = { type: 'string', minLength: 1, maxLength: 200, pattern: '\\S' } as const;
const password = { type: 'string', minLength: 1, maxLength: 200 } as const;
const email = { type: 'string', maxLength: 254, pattern: EMAIL_PATTERN } as const;
const role = { type: 'string', enum: [...ROLES] } as const;

const newUserBody: JSONSchemaType<NewUser> = {
  type: 'object',
  properties: { email, name, role, password },
  required: ['email', 'name', 'role', 'password'],
  additionalProperties: false,
};

const patchBody: JSONSchemaType<UserPatch> = {
  type: 'object',
  properties: { role: { ...role, nullable: true }, disabled: { type: 'boolean', nullable: true }, name: { ...name, nullable: true } },
  additionalProperties: false,
  minProperties: 1,
};

const passwordBody: JSONSchemaType<{ password: string }> = {
  type: 'object',
  properties: { password },
  required: ['password'],
  additionalProperties: false,
};

const ownPasswordBody: JSONSchemaType<{ currentPassword: string; newPassword: string }> = {
  type: 'object',
  properties: { currentPassword: password, newPassword: password },
  required: ['currentPassword', 'newPassword'],
  additionalProperties: false,
};

const checkNewUser = bodyChecker(newUserBody);
const checkPatch = bodyChecker(patchBody);
const checkPassword = bodyChecker(passwordBody);
const checkOwnPassword = bodyChecker(ownPasswordBody);

export function usersRouter(mount: MountRoute, users: UsersService, issueToken: (u: import('./user.model.ts').User) => string) {
  const router = Router();

  mount(router, 'me.get', (req, res) => {
    res.json({ user: toPublicUser(currentUser(req)) });
  });

  mount(router, 'me.password', requireJson, async (req, res) => {
    const body = checkOwnPassword(req.body);
    const user = await users.changeOwnPassword(currentUser(req), body.currentPassword, body.newPassword);
    // The old token stopped working with the change: hand over a fresh one.
    res.json({ ok: true, token: issueToken(user), user: toPublicUser(user) });
  });

  mount(router, 'users.list', async (_req, res) => {
    res.json({ items: (await users.list()).map(toPublicUser) });
  });

  mount(router, 'users.create', requireJson, async (req, res) => {
    const user = await users.create(checkNewUser(req.body), currentUser(req));
    res.status(201).json({ user: toPublicUser(user) });
  });

  mount(router, 'users.update', requireJson, async (req, res) => {
    const id = idParam(req.params.id, 'the account');
    const user = await users.update(id, checkPatch(req.body), currentUser(req));
    res.json({ user: toPublicUser(user) });
  });

  mount(router, 'users.password', requireJson, async (req, res) => {
    const id = idParam(req.params.id, 'the account');
    const user = await users.setPassword(id, checkPassword(req.body).password, currentUser(req));
    res.json({ ok: true, user: toPublicUser(user) });
  });

  return router;
}
