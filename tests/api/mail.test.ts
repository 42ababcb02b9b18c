import { readdir, readFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { account, push, review, siteText, startWeir, undersizedCts, type Account, type TestWeir } from './helpers.ts';

interface Caught {
  from: string;
  to: string[];
  raw: string;
}

/** An SMTP server in this process: nodemailer talks real SMTP to it on 127.0.0.1. */
async function startCatcher() {
  const messages: Caught[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        messages.push({ from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '', to: session.envelope.rcptTo.map((r) => r.address), raw: Buffer.concat(chunks).toString('utf8') });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.server.address() as AddressInfo).port;
  return { messages, url: `smtp://127.0.0.1:${port}`, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

/** The decoded subject and body of a plain-text message as nodemailer writes it. */
function readMessage(raw: string) {
  const [head, ...body] = raw.split(/\r?\n\r?\n/);
  const unfolded = head.replace(/\r?\n[ \t]+/g, ' ');
  const subjectLine = /^Subject: (.*)$/m.exec(unfolded)?.[1] ?? '';
  // RFC 2047 encoded words, which nodemailer uses for non-ASCII subjects.
  const subject = subjectLine.replace(/=\?utf-8\?Q\?(.*?)\?=/gi, (_m, q: string) => Buffer.from(q.replace(/_/g, ' ').replace(/=([0-9A-F]{2})/gi, (_x, h: string) => String.fromCharCode(parseInt(h, 16))), 'latin1').toString('utf8')).replace(/\?= =\?/g, '');
  const text = body.join('\n\n').replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/g, (_x, h: string) => String.fromCharCode(parseInt(h, 16)));
  return { subject, text };
}

describe('e-mail over SMTP', () => {
  let catcher: Awaited<ReturnType<typeof startCatcher>>;
  let weir: TestWeir;
  let installer: Account;
  let lead: Account;
  let lead2: Account;

  beforeAll(async () => {
    catcher = await startCatcher();
    weir = await startWeir({ SMTP_URL: catcher.url, WEIR_MAIL_FROM: 'Weir <weir@example.test>', WEIR_PUBLIC_URL: 'http://weir.example.test' });
    [installer, lead, lead2] = await Promise.all([account(weir, 'installer'), account(weir, 'lead'), account(weir, 'lead', 'lead2')]);
  });
  afterAll(async () => {
    await weir.close();
    await catcher.close();
  });

  it('When an installer pushes, then every lead is told over SMTP that the revision awaits review', async () => {
    const res = await push(weir, installer, await siteText(), 'First design').expect(201);
    await weir.runtime.mailer.idle();
    const got = catcher.messages.filter((m) => m.raw.includes('awaits review'));
    expect(got.map((m) => m.to[0]).sort()).toEqual([lead.email, lead2.email].sort());
    for (const m of got) expect(m.from).toBe('weir@example.test');
    const { subject, text } = readMessage(got[0].raw);
    expect(subject).toBe('[Weir] Mill Lane Bakery: revision 1 awaits review');
    expect(text).toContain(`pushed revision 1 of Mill Lane Bakery (mill-lane-bakery)`);
    expect(text).toContain('Message: First design');
    expect(text).toContain(`http://weir.example.test/revisions/${res.body.revision.id}`);
  });

  it('When a lead pushes, then the other leads are told but not the author', async () => {
    catcher.messages.length = 0;
    await push(weir, lead, await siteText([['id: mill-lane-bakery', 'id: lead-site']])).expect(201);
    await weir.runtime.mailer.idle();
    expect(catcher.messages.map((m) => m.to[0])).toEqual([lead2.email]);
  });

  it('When a revision is approved or returned, then its author is told, with the comment', async () => {
    catcher.messages.length = 0;
    const site = await api(weir).get('/api/sites/mill-lane-bakery').set(installer.auth).expect(200);
    await review(weir, lead, site.body.latest.id, 'approve', 'Good to go').expect(200);
    const bad = await push(weir, installer, await siteText(undersizedCts())).expect(201);
    // The leads hear of it before it is returned (a notice still gathering when it is decided is dropped).
    await weir.runtime.mailer.idle();
    await review(weir, lead2, bad.body.revision.id, 'return', 'The CTs are too small for 80 A').expect(200);
    await weir.runtime.mailer.idle();
    const toAuthor = catcher.messages.filter((m) => m.to[0] === installer.email).map((m) => readMessage(m.raw));
    expect(toAuthor.map((m) => m.subject)).toEqual(['[Weir] Mill Lane Bakery: revision 1 approved', '[Weir] Mill Lane Bakery: revision 2 returned']);
    expect(toAuthor[0].text).toContain('Comment: Good to go');
    expect(toAuthor[1].text).toContain('Comment: The CTs are too small for 80 A');
    // The errors are named in the lead's notice of the second push.
    const notice = catcher.messages.find((m) => m.to[0] === lead.email && m.raw.includes('revision 2 awaits review'))!;
    expect(readMessage(notice.raw).text).toContain('It has 3 error finding(s), which block approval');
  });

  it('When a lead pushes a folder of sites, then each other lead gets one message listing them all', async () => {
    catcher.messages.length = 0;
    const ids = ['digest-a', 'digest-b', 'digest-c'];
    const texts = await Promise.all(ids.map((id, i) => siteText([['id: mill-lane-bakery', `id: ${id}`], ['name: Mill Lane Bakery', `name: Digest Site ${i + 1}`]])));
    const pushed = await Promise.all(texts.map((t) => push(weir, lead, t).expect(201)));
    await weir.runtime.mailer.idle();
    // The author hears nothing of their own pushes; the other lead hears once.
    expect(catcher.messages.map((m) => m.to[0])).toEqual([lead2.email]);
    const { subject, text } = readMessage(catcher.messages[0].raw);
    expect(subject).toBe('[Weir] 3 revisions await review');
    for (const [i, res] of pushed.entries()) {
      expect(text).toContain(`Digest Site ${i + 1} (${ids[i]}), revision 1 by Test lead`);
      expect(text).toContain(`http://weir.example.test/revisions/${res.body.revision.id}`);
    }
  });

  it('When a gathered revision is superseded or decided before the digest goes, then it is left out', async () => {
    catcher.messages.length = 0;
    const one = await siteText([['id: mill-lane-bakery', 'id: digest-late'], ['name: Mill Lane Bakery', 'name: Late Yard']]);
    await push(weir, installer, one).expect(201);
    const newer = await push(weir, installer, one.replace('name: Late Yard', 'name: Late Yard West')).expect(201);
    const other = await push(weir, installer, await siteText([['id: mill-lane-bakery', 'id: digest-decided'], ['name: Mill Lane Bakery', 'name: Decided Yard']])).expect(201);
    await review(weir, lead2, other.body.revision.id, 'approve').expect(200);
    await weir.runtime.mailer.idle();
    // Only the newer revision of Late Yard still awaits review: one plain message per lead.
    const notices = catcher.messages.filter((m) => m.raw.includes('awaits review') || m.raw.includes('await review')).map((m) => ({ to: m.to[0], ...readMessage(m.raw) }));
    expect(notices.map((n) => n.to).sort()).toEqual([lead.email, lead2.email].sort());
    for (const n of notices) {
      expect(n.subject).toBe('[Weir] Late Yard West: revision 2 awaits review');
      expect(n.text).toContain(`/revisions/${newer.body.revision.id}`);
    }
  });

  it('When mail goes out over SMTP, then the outbox listing is empty', async () => {
    const admin = await account(weir, 'admin');
    expect((await api(weir).get('/api/outbox').set(admin.auth).expect(200)).body.items).toEqual([]);
  });
});

describe('e-mail to the outbox folder', () => {
  let weir: TestWeir;
  let installer: Account;
  let lead: Account;
  let admin: Account;

  beforeAll(async () => {
    weir = await startWeir();
    [installer, lead, admin] = await Promise.all([account(weir, 'installer'), account(weir, 'lead'), account(weir, 'admin')]);
  });
  afterAll(() => weir.close());

  it('When SMTP_URL is unset, then messages are .eml files in the outbox and GET /api/outbox lists them for admins', async () => {
    await push(weir, installer, await siteText()).expect(201);
    await weir.runtime.mailer.idle();
    const files = await readdir(weir.config.outboxDir);
    const eml = files.filter((f) => f.endsWith('.eml'));
    expect(eml).toHaveLength(1);
    const raw = await readFile(path.join(weir.config.outboxDir, eml[0]), 'utf8');
    expect(raw).toMatch(/^To: lead@example\.test$/m);
    expect(raw).toMatch(/^Subject: \[Weir\] Mill Lane Bakery: revision 1 awaits review$/m);

    const res = await api(weir).get('/api/outbox').set(admin.auth).expect(200);
    expect(res.body.items).toEqual([{ id: eml[0].replace(/\.eml$/, ''), to: lead.email, subject: '[Weir] Mill Lane Bakery: revision 1 awaits review', date: expect.any(String), text: expect.stringContaining('Review it:') }]);
  });

  it('When someone other than an admin asks for the outbox, then 403', async () => {
    for (const who of [installer, lead]) expect((await api(weir).get('/api/outbox').set(who.auth).expect(403)).body.error.code).toBe('forbidden');
  });
});

const api = (weir: TestWeir) => request(weir.app);

describe('the awaiting-review digest on its own clock', () => {
  let weir: TestWeir;
  beforeAll(async () => {
    weir = await startWeir({ WEIR_MAIL_DIGEST_S: '1' });
  });
  afterAll(() => weir.close());

  it('When nobody waits for the mail, then the gathered notice still goes out once the digest time has passed', async () => {
    const [installer, lead] = await Promise.all([account(weir, 'installer'), account(weir, 'lead')]);
    const pushedAt = Date.now();
    await push(weir, installer, await siteText()).expect(201);
    // Nothing yet: the push is gathered for a second.
    expect(await emlFiles(weir)).toEqual([]);
    let files: string[] = [];
    for (let i = 0; i < 100 && !files.length; i++) {
      await new Promise((r) => setTimeout(r, 50));
      files = await emlFiles(weir);
    }
    expect(files).toHaveLength(1);
    expect(Date.now() - pushedAt).toBeGreaterThanOrEqual(900);
    const raw = await readFile(path.join(weir.config.outboxDir, files[0]), 'utf8');
    expect(raw).toContain(`To: ${lead.email}`);
  });
});

async function emlFiles(weir: TestWeir): Promise<string[]> {
  try {
    return (await readdir(weir.config.outboxDir)).filter((f) => f.endsWith('.eml'));
  } catch {
    return [];
  }
}
