import type { JSONSchemaType } from 'ajv';
import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Config } from '../config.ts';
import { AppError } from '../lib/app-error.ts';
import type { MountRoute } from '../lib/route.ts';
import { bodyChecker } from '../lib/validate.ts';
import { requireJson } from '../middleware/error-handler.ts';
import { toPublicUser } from '../users/user.model.ts';
import type { AuthService } from './auth.service.ts';

const loginBody: JSONSchemaType<{ email: string; password: string }> = {
  type: 'object',
  properties: { email: { type: 'string', minLength: 1, maxLength: 254 }, password: { type: 'string', minLength: 1, maxLength: 200 } },
  required: ['email', 'password'],
  additionalProperties: false,
};
const checkLogin = bodyChecker(loginBody);

export function authRouter(mount: MountRoute, auth: AuthService, config: Config) {
  const router = Router();
  // Failed attempts per client address; a successful sign-in does not count. The count lives in
  // this process: behind several replicas, the proxy in front should limit too.
  const limiter = rateLimit({
    windowMs: config.loginRateWindowMs,
    limit: config.loginRateLimit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next, options) => {
      next(new AppError(429, 'rate-limited', `too many failed sign-ins from this address: try again in ${Math.ceil(options.windowMs / 60_000)} minutes`));
    },
  });

  mount(router, 'auth.login', limiter, requireJson, async (req, res) => {
    const { email, password } = checkLogin(req.body);
    const { token, user } = await auth.login(email, password);
    res.json({ token, user: toPublicUser(user) });
  });

  return router;
}
