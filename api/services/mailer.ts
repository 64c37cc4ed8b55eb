import nodemailer, { type Transporter } from 'nodemailer';
import { and, desc, eq, lt, or } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../db/client.js';
import { outboxMessages } from '../db/schema.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface OutboxMessageView {
  id: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  createdAt: string;
}

/**
 * Sends through SMTP when SMTP_URL is configured; otherwise through a local sink that keeps every
 * message in the database (the operator reads it at /v1/dev/outbox). Both go through nodemailer,
 * so messages are built the same way either way.
 */
export function createMailer({ db, smtpUrl, from, clock }: { db: Db; smtpUrl?: string; from: string; clock: () => Date }) {
  const transport: Transporter = smtpUrl ? nodemailer.createTransport(smtpUrl) : nodemailer.createTransport({ jsonTransport: true });
  return {
    /** True when messages go to the local sink (and /v1/dev/outbox exists). */
    usesLocalSink: !smtpUrl,

    async send(message: MailMessage): Promise<void> {
      const info = await transport.sendMail({ from, ...message });
      if (!smtpUrl) {
        // jsonTransport only renders the message; keep it so the operator can read it.
        const rendered = JSON.parse((info as unknown as { message: string }).message) as { to?: { address: string }[] };
        await db.insert(outboxMessages).values({
          to: rendered.to?.map((a) => a.address).join(', ') ?? message.to,
          subject: message.subject,
          text: message.text,
          html: message.html ?? null,
          createdAt: clock(),
        });
      }
    },

    async outbox(page: PageQuery): Promise<Page<OutboxMessageView>> {
      const before = decodeCursor(page.cursor, z.tuple([z.iso.datetime(), z.uuid()]));
      const rows = await db
        .select()
        .from(outboxMessages)
        .where(
          before
            ? or(lt(outboxMessages.createdAt, new Date(before[0])), and(eq(outboxMessages.createdAt, new Date(before[0])), lt(outboxMessages.id, before[1])))
            : undefined,
        )
        .orderBy(desc(outboxMessages.createdAt), desc(outboxMessages.id))
        .limit(page.limit + 1);
      return toPage(
        rows,
        page.limit,
        (r) => ({ id: r.id, to: r.to, subject: r.subject, text: r.text, html: r.html, createdAt: r.createdAt.toISOString() }),
        (r) => [r.createdAt.toISOString(), r.id],
      );
    },
  };
}

export type Mailer = ReturnType<typeof createMailer>;
