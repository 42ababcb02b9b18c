import { QueryTypes } from 'sequelize';
import type { PushedRevision, RevisionEvents } from '../revisions/revisions.service.ts';
import { Review } from '../revisions/review.model.ts';
import { Revision } from '../revisions/revision.model.ts';
import { Site } from '../sites/site.model.ts';
import { User } from '../users/user.model.ts';
import type { Mailer } from './mailer.ts';

/**
 * Who hears about what: every active lead but the author when a revision awaits review, the
 * author when it is approved or returned. Runs after the change has committed; a failure here
 * is logged and never undoes the change.
 */
export function createNotifications({ mailer, publicUrl }: { mailer: Mailer; publicUrl: string }): RevisionEvents {
  const load = async (revisionId: number) => {
    const revision = await Revision.findByPk(revisionId, { attributes: ['id', 'siteId', 'number', 'state', 'message', 'errorCount', 'warningCount', 'authorId'], include: [{ model: User, as: 'author' }] });
    const site = revision && (await Site.findByPk(revision.siteId, { attributes: ['id', 'name'] }));
    return revision && site ? { revision, site } : null;
  };
  // The reviewer's page of one revision (web/src/app/router.tsx).
  const link = (revisionId: number) => `${publicUrl}/revisions/${revisionId}`;
  const run = (what: string, task: () => Promise<void>) => mailer.later(`the ${what} notice`, task);

  return {
    pushed(revisionId, pushed) {
      run('awaiting-review', async () => {
        // The push hands over what it stored; read it back only when it did not.
        let notice: PushedRevision;
        if (pushed) notice = pushed;
        else {
          const found = await load(revisionId);
          if (!found) return;
          const { revision, site } = found;
          const a = revision.author;
          notice = { siteId: site.id, siteName: site.name, number: revision.number, message: revision.message, errorCount: revision.errorCount, warningCount: revision.warningCount, author: a ? { id: a.id, name: a.name, email: a.email } : null };
        }
        // Read afresh on every push: a lead disabled in another process must hear no more.
        const leads = (await User.sequelize!.query('SELECT id, email, name FROM users WHERE role = ? AND disabled = 0', { replacements: ['lead'], type: QueryTypes.SELECT })) as { id: number; email: string; name: string }[];
        const author = notice.author;
        const findings = notice.errorCount
          ? `It has ${notice.errorCount} error finding(s), which block approval, and ${notice.warningCount} warning(s).`
          : `It has no error findings and ${notice.warningCount} warning(s).`;
        for (const lead of leads) {
          if (author && lead.id === author.id) continue;
          mailer.send({
            to: lead.email,
            subject: `[Weir] ${notice.siteName}: revision ${notice.number} awaits review`,
            text: [
              `Hello ${lead.name},`,
              '',
              `${author?.name ?? 'Someone'} (${author?.email ?? 'unknown'}) pushed revision ${notice.number} of ${notice.siteName} (${notice.siteId}).`,
              notice.message ? `Message: ${notice.message}` : 'No message was given.',
              findings,
              '',
              `Review it: ${link(revisionId)}`,
            ].join('\n'),
          });
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
