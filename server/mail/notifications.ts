import { QueryTypes } from 'sequelize';
import type { PushedRevision, RevisionEvents } from '../revisions/revisions.service.ts';
import { Review } from '../revisions/review.model.ts';
import { Revision } from '../revisions/revision.model.ts';
import { Site } from '../sites/site.model.ts';
import { User } from '../users/user.model.ts';
import type { Mailer } from './mailer.ts';

/** Revisions named one by one in a digest; past this, the message counts the rest. */
const DIGEST_LIST_MAX = 50;

interface Lead {
  id: number;
  email: string;
  name: string;
}

const findingsLine = (n: PushedRevision) =>
  n.errorCount
    ? `It has ${n.errorCount} error finding(s), which block approval, and ${n.warningCount} warning(s).`
    : `It has no error findings and ${n.warningCount} warning(s).`;

/**
 * Who hears about what: every active lead but the author when a revision awaits review, the
 * author when it is approved or returned. Runs after the change has committed; a failure here
 * is logged and never undoes the change.
 *
 * Pushes are gathered for `digestMs`: a lead hears of one push in one message as before, and of
 * `weir push` of a folder of 200 sites in one message that lists them, not in 200 messages.
 * A revision decided or superseded while its notice waited is left out.
 */
export function createNotifications({ mailer, publicUrl, digestMs }: { mailer: Mailer; publicUrl: string; digestMs: number }): RevisionEvents {
  const load = async (revisionId: number) => {
    const revision = await Revision.findByPk(revisionId, { attributes: ['id', 'siteId', 'number', 'state', 'message', 'errorCount', 'warningCount', 'authorId'], include: [{ model: User, as: 'author' }] });
    const site = revision && (await Site.findByPk(revision.siteId, { attributes: ['id', 'name'] }));
    return revision && site ? { revision, site } : null;
  };
  // The reviewer's page of one revision (web/src/app/router.tsx).
  const link = (revisionId: number) => `${publicUrl}/revisions/${revisionId}`;
  const run = (what: string, task: () => Promise<void>) => mailer.later(`the ${what} notice`, task);

  /** The notices of one push, or of several pushes gathered, to one lead. */
  function awaitingReview(lead: Lead, notices: { revisionId: number; notice: PushedRevision }[]) {
    if (notices.length === 1) {
      const [{ revisionId, notice }] = notices;
      const author = notice.author;
      return {
        to: lead.email,
        subject: `[Weir] ${notice.siteName}: revision ${notice.number} awaits review`,
        text: [
          `Hello ${lead.name},`,
          '',
          `${author?.name ?? 'Someone'} (${author?.email ?? 'unknown'}) pushed revision ${notice.number} of ${notice.siteName} (${notice.siteId}).`,
          notice.message ? `Message: ${notice.message}` : 'No message was given.',
          findingsLine(notice),
          '',
          `Review it: ${link(revisionId)}`,
        ].join('\n'),
      };
    }
    const blocked = notices.filter((n) => n.notice.errorCount > 0).length;
    const listed = notices.slice(0, DIGEST_LIST_MAX).map(({ revisionId, notice }) => {
      const who = notice.author ? ` by ${notice.author.name}` : '';
      const counts = notice.errorCount ? `${notice.errorCount} error(s), ${notice.warningCount} warning(s)` : `no errors, ${notice.warningCount} warning(s)`;
      return `- ${notice.siteName} (${notice.siteId}), revision ${notice.number}${who}: ${counts}\n  ${link(revisionId)}`;
    });
    const rest = notices.length - listed.length;
    return {
      to: lead.email,
      subject: `[Weir] ${notices.length} revisions await review`,
      text: [
        `Hello ${lead.name},`,
        '',
        `${notices.length} revisions were pushed and await review; ${blocked ? `${blocked} of them have error findings, which block approval` : 'none of them has error findings'}.`,
        '',
        ...listed,
        ...(rest > 0 ? ['', `… and ${rest} more: ${publicUrl}/sites?state=pending`] : []),
      ].join('\n'),
    };
  }

  /** The pushes waiting for the next digest; null while none is due. */
  let gathered: { revisionId: number; notice: PushedRevision }[] | null = null;

  return {
    pushed(revisionId, notice) {
      if (gathered) {
        gathered.push({ revisionId, notice });
        return;
      }
      const notices = (gathered = [{ revisionId, notice }]);
      mailer.defer('the awaiting-review notices', digestMs, async () => {
        gathered = null;
        // What was approved, returned or superseded meanwhile awaits review no more.
        const ids = notices.map((n) => n.revisionId);
        const open = new Set(
          ((await Revision.sequelize!.query(`SELECT id FROM revisions WHERE state = 'pending' AND id IN (${ids.map(() => '?').join(', ')})`, { replacements: ids, type: QueryTypes.SELECT })) as { id: number }[]).map((r) => r.id),
        );
        const waiting = notices.filter((n) => open.has(n.revisionId));
        if (!waiting.length) return;
        // Read afresh for every digest: a lead disabled in another process must hear no more.
        const leads = (await User.sequelize!.query('SELECT id, email, name FROM users WHERE role = ? AND disabled = 0', { replacements: ['lead'], type: QueryTypes.SELECT })) as Lead[];
        for (const lead of leads) {
          const own = waiting.filter((n) => n.notice.author?.id !== lead.id);
          if (own.length) mailer.send(awaitingReview(lead, own));
        }
      });
    },
    decided(revisionId) {
      run('decision', async () => {
        const found = await load(revisionId);
        if (!found?.revision.author) return;
        const { revision, site } = found;
        const review = await Review.findOne({ where: { revisionId }, order: [['id', 'DESC']], include: [{ model: User, as: 'reviewer' }] });
        if (!review) return;
        const approved = review.decision === 'approve';
        mailer.send({
          to: revision.author!.email,
          subject: `[Weir] ${site.name}: revision ${revision.number} ${approved ? 'approved' : 'returned'}`,
          text: [
            `Hello ${revision.author!.name},`,
            '',
            `${review.reviewer?.name ?? 'A lead engineer'} ${approved ? 'approved' : 'returned'} revision ${revision.number} of ${site.name} (${site.id}).`,
            review.comment ? `Comment: ${review.comment}` : 'No comment was given.',
            approved ? 'It is now the approved configuration of the site.' : 'Change the site file and push it again.',
            '',
            link(revision.id),
          ].join('\n'),
        });
      });
    },
  };
}
