/**
 * Outgoing mail. With SMTP_URL: a real SMTP transport (nodemailer). Without it: a local fake that
 * stores every message in mail_outbox, where a team's owners can read it (GET /api/teams/:id/outbox).
 * In SMTP mode messages are sent and not stored.
 */
import nodemailer from 'nodemailer';
import type { Db } from '../db/client';
import { sql } from 'drizzle-orm';
import { mailOutbox } from '../db/schema';
import { newId } from '../ids';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** The team the message is about (invites); null for account mail. */
  teamId: string | null;
  /** The account the message is for, when the sender knows it; otherwise the outbox looks the address up. */
  recipientId?: string;
}

export interface Mailer {
  mode: 'smtp' | 'outbox';
  sendMail(mail: OutgoingMail): Promise<void>;
  close(): Promise<void>;
}

export const MAIL_FROM = 'Bankwright <no-reply@bankwright.invalid>';

export function createOutboxMailer(db: Db): Mailer {
  return {
    mode: 'outbox',
    async sendMail(mail) {
      await db.insert(mailOutbox).values({
        id: newId(),
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        html: mail.html,
        teamId: mail.teamId,
        // Whose own outbox shows it: the account holding the address now (an address nobody has: nobody's).
        recipientId: mail.recipientId ?? sql`(select "id" from "users" where "email" = ${mail.to})`,
      });
    },
    async close() {},
  };
}

export function createSmtpMailer(smtpUrl: string, from = MAIL_FROM): Mailer {
  const transport = nodemailer.createTransport(smtpUrl);
  return {
    mode: 'smtp',
    async sendMail(mail) {
      await transport.sendMail({ from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    },
    async close() {
      transport.close();
    },
  };
}

export function createMailer(opts: { db: Db; smtpUrl?: string }): Mailer {
  return opts.smtpUrl ? createSmtpMailer(opts.smtpUrl) : createOutboxMailer(opts.db);
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
