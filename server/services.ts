import type { Logger } from 'pino';
import { createAttachmentsService } from './attachments/attachments.service.ts';
import type { BlobStorage } from './attachments/storage.ts';
import { createAuditService } from './audit/audit.service.ts';
import { createAuthService } from './auth/auth.service.ts';
import type { Config } from './config.ts';
import type { Database } from './db.ts';
import type { Mailer } from './mail/mailer.ts';
import { createNotifications } from './mail/notifications.ts';
import { createRevisionsService } from './revisions/revisions.service.ts';
import { createSitesService } from './sites/sites.service.ts';
import { createUsersService } from './users/users.service.ts';

/** What the app needs from outside: the database and the upload store are its only state. */
export interface AppDeps {
  config: Config;
  db: Database;
  mailer: Mailer;
  storage: BlobStorage;
  logger: Logger;
  /** The clock; the seed sets it back to lay out a believable history. */
  now?: () => Date;
}

export function createServices(deps: AppDeps) {
  const { db, config, mailer, storage } = deps;
  const now = deps.now ?? (() => new Date());
  const audit = createAuditService({ db, now });
  const events = createNotifications({ mailer, publicUrl: config.publicUrl, digestMs: config.mailDigestMs });
  return {
    now,
    audit,
    auth: createAuthService({ db, audit, config }),
    users: createUsersService({ db, audit, now }),
    revisions: createRevisionsService({ db, audit, now, events }),
    sites: createSitesService({ db }),
    attachments: createAttachmentsService({ db, audit, storage, now }),
  };
}

export type Services = ReturnType<typeof createServices>;
