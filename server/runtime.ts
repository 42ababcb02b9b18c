import { pino, type Logger } from 'pino';
import { createLocalStorage } from './attachments/storage.ts';
import type { Config } from './config.ts';
import { openDatabase, type DatabaseOptions } from './db.ts';
import { createMailer } from './mail/mailer.ts';
import type { AppDeps } from './services.ts';

export interface Runtime extends AppDeps {
  /** Waits for queued mail, then closes the mail transport and the database. */
  close(): Promise<void>;
}

/** Opens everything the app depends on, from a configuration. */
export async function openRuntime(config: Config, options: { logger?: Logger; now?: () => Date; onStatement?: DatabaseOptions['onStatement'] } = {}): Promise<Runtime> {
  const logger = options.logger ?? pino({ level: config.logLevel });
  const db = await openDatabase(config.databaseFile, { onStatement: options.onStatement });
  const mailer = createMailer({ smtpUrl: config.smtpUrl, outboxDir: config.outboxDir, from: config.mailFrom, logger });
  const storage = createLocalStorage(config.uploadsDir);
  return {
    config,
    db,
    mailer,
    storage,
    logger,
    now: options.now,
    async close() {
      await mailer.idle();
      mailer.close();
      await db.close();
    },
  };
}
