import { randomBytes } from 'node:crypto';
import { mkdir, readFile, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import nodemailer from 'nodemailer';
import type { Logger } from 'pino';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
}

export interface OutboxItem {
  id: string;
  to: string;
  subject: string;
  date: string;
  text: string;
}

export interface Mailer {
  /** Queues a message; delivery never fails the request that caused it (failures are logged). */
  send(message: MailMessage): void;
  /** Runs mail work in the background, logged on failure and awaited by `idle`. */
  later(what: string, task: () => Promise<void>): void;
  /**
   * Runs `task` in the background after `delayMs`, or at once when `idle` is called: for notices
   * that gather what happens in a short while into one message.
   */
  defer(what: string, delayMs: number, task: () => Promise<void>): void;
  /** Runs deferred work now, then resolves when every queued message has been delivered or has failed. */
  idle(): Promise<void>;
  /** Messages kept in the outbox folder, newest first; empty when mail goes out over SMTP. */
  outbox(limit?: number): Promise<OutboxItem[]>;
  close(): void;
}

export interface MailerOptions {
  smtpUrl: string | null;
  outboxDir: string;
  from: string;
  logger: Logger;
}

/**
 * nodemailer over SMTP_URL; without one, every message is rendered by nodemailer all the same
 * and written to the outbox folder as an .eml file (with a .json beside it for the listing).
 */
export function createMailer({ smtpUrl, outboxDir, from, logger }: MailerOptions): Mailer {
  const hurry = new Set<() => void>();
  const transport = smtpUrl ? nodemailer.createTransport(smtpUrl) : nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
  const pending = new Set<Promise<void>>();

  /** The folder is made when the first write finds it missing (not checked on every message). */
  async function writeOutbox(name: string, data: string | Buffer) {
    const file = path.join(outboxDir, name);
    try {
      await writeFile(file, data);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
      await mkdir(outboxDir, { recursive: true });
      await writeFile(file, data);
    }
  }

  async function deliver(message: MailMessage) {
    const date = new Date();
    const info = await transport.sendMail({ from, to: message.to, subject: message.subject, text: message.text, date });
    if (smtpUrl) return;
    const raw = (info as unknown as { message: Buffer }).message;
    const id = `${date.toISOString().replace(/[:.]/g, '-')}-${randomBytes(4).toString('hex')}`;
    await writeOutbox(`${id}.eml`, raw);
    const item: OutboxItem = { id, to: message.to, subject: message.subject, date: date.toISOString(), text: message.text };
    await writeOutbox(`${id}.json`, JSON.stringify(item, null, 2));
  }

  const later = (what: string, task: () => Promise<void>) => {
    const job: Promise<void> = task()
      .catch((err) => logger.error({ err }, `mail: ${what} failed`))
      .finally(() => pending.delete(job));
    pending.add(job);
  };

  const defer = (what: string, delayMs: number, task: () => Promise<void>) => {
    later(what, async () => {
      await new Promise<void>((resolve) => {
        const now = () => {
          clearTimeout(timer);
          hurry.delete(now);
          resolve();
        };
        const timer = setTimeout(now, delayMs);
        hurry.add(now);
      });
      await task();
    });
  };

  return {
    later,
    defer,
    send(message) {
      later(`delivery to ${message.to} of "${message.subject}"`, () => deliver(message));
    },
    async idle() {
      while (pending.size) {
        for (const now of [...hurry]) now();
        await Promise.allSettled([...pending]);
      }
    },
    async outbox(limit = 100) {
      if (smtpUrl) return [];
      let names: string[];
      try {
        names = await readdir(outboxDir);
      } catch {
        return [];
      }
      const newest = names.filter((n) => n.endsWith('.json')).sort().reverse().slice(0, limit);
      const items = await Promise.all(newest.map(async (n) => JSON.parse(await readFile(path.join(outboxDir, n), 'utf8')) as OutboxItem));
      return items;
    },
    close() {
      transport.close();
    },
  };
}
