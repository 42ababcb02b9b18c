// `weir audit verify`: asks the server to walk the change log's hash chain.
import type { VerifyAnswer } from '../lib/api-types.ts';
import { createColour } from '../lib/colour.ts';
import { EXIT_FINDINGS, EXIT_OK } from '../lib/errors.ts';
import { openSession } from '../lib/session.ts';

export async function runAuditVerify(options: { server?: string; format?: string; color?: boolean }): Promise<void> {
  const session = openSession(options);
  const answer = await session.client.get<VerifyAnswer>('/api/audit/verify');
  process.exitCode = answer.ok ? EXIT_OK : EXIT_FINDINGS;
  if (options.format === 'json') {
    process.stdout.write(`${JSON.stringify({ server: session.server, ...answer }, null, 2)}\n`);
    return;
  }
  const c = createColour(process.stdout, options);
  if (answer.ok) {
    process.stdout.write(`${c.green('ok')}: the change log on ${session.server} is intact (${answer.events} events, every hash follows from the one before).\n`);
    // A chain cannot see its newest events cut off: the head, written down, can.
    if (answer.headHash) process.stdout.write(`head: event #${answer.events} has hash ${answer.headHash}; keep it, and a later verify with fewer events or without this hash means events were removed.\n`);
    return;
  }
  const bad = answer.firstBadEvent;
  const detail = bad ? `first bad event: #${bad.seq}${bad.reason ? ` (${bad.reason})` : ''}${bad.message ? `: ${bad.message}` : ''}` : 'the server named no event';
  process.stdout.write(`${c.red.bold('broken')}: the change log on ${session.server} has been altered; ${detail}.\n`);
}
