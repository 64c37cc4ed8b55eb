import { and, eq, isNull } from 'drizzle-orm';
import type { Db } from '../../db/client.js';
import { batchJobs, users } from '../../db/schema.js';
import type { Mailer } from '../mailer.js';
import { adminEmails } from '../org-admins.js';
import { batchLink, type BatchJobRow } from './view.js';

/** Who hears that a job ended: the user who created it, or for a key the organisation's admins. */
async function recipients(db: Db, job: BatchJobRow): Promise<string[]> {
  if (job.createdByType === 'user') {
    const [user] = await db.select({ email: users.email }).from(users).where(eq(users.id, job.createdById));
    return user ? [user.email] : [];
  }
  return adminEmails(db, job.organizationId);
}

function message(job: BatchJobRow, publicUrl: string): { subject: string; text: string } {
  const label = job.name ? `"${job.name}"` : job.id;
  const rows = `${job.rowsDone} of ${job.rowsTotal} rows answered: ${job.rowsOk} sized (${job.rowsWithFailingChecks} with failing checks), ${job.rowsFailed} with a problem.`;
  const outcome =
    job.status === 'succeeded'
      ? { subject: `Treadwise: batch job ${label} has finished`, line: 'Every row has been answered.' }
      : job.status === 'stopped'
        ? { subject: `Treadwise: batch job ${label} stopped at the monthly quota`, line: 'The organisation’s monthly quota ran out; the rows done are kept. A new job can size the rest once the quota allows.' }
        : { subject: `Treadwise: batch job ${label} failed`, line: 'The job broke on our side; the rows done are kept. Please try again or tell the Treadwise team.' };
  const text = [
    'Hello,',
    '',
    `${outcome.line}`,
    rows,
    '',
    `Results: GET ${publicUrl}${batchLink(job.id)}/results?format=csv (or ?format=ndjson); rows with problems: GET ${publicUrl}${batchLink(job.id)}/errors.`,
    `The job and its results are kept until ${job.expiresAt.toISOString()}.`,
    '',
    '— Treadwise',
  ].join('\n');
  return { subject: outcome.subject, text };
}

/**
 * Tells the creator once that a job has ended (succeeded, stopped at the quota, failed; a cancel
 * was their own doing). `notified_at` is set first, so only one instance sends it.
 */
export async function notifyEnded({ db, mailer, clock, publicUrl }: { db: Db; mailer: Mailer; clock: () => Date; publicUrl: string }, jobId: string): Promise<void> {
  const [job] = await db
    .update(batchJobs)
    .set({ notifiedAt: clock() })
    .where(and(eq(batchJobs.id, jobId), isNull(batchJobs.notifiedAt)))
    .returning();
  if (!job || job.status === 'cancelled') return;
  const to = await recipients(db, job);
  const { subject, text } = message(job, publicUrl);
  await Promise.all(to.map((address) => mailer.send({ to: address, subject, text })));
}
