/**
 * Account mail sent by sign-up. Both answers of a sign-up send exactly one message, so the work (and
 * the time) does not differ between a new and a known address (OWASP ASVS 5.0 6.3.8):
 *   - a new account: "Welcome" — also tells the owner of the address if someone else used it;
 *   - a known address: "Someone tried to sign up with this address" — the account already exists,
 *     nothing was changed, and how to sign in.
 */
import { escapeHtml, type OutgoingMail } from './mailer';

export function welcomeMail(to: string, name: string, appOrigin: string): OutgoingMail {
  const link = `${appOrigin}/sign-in`;
  return {
    to,
    teamId: null,
    subject: 'Your Bankwright account',
    text:
      `Hello ${name},\n\nA Bankwright account was created with this e-mail address. Sign in at ${link}.\n\n` +
      `If you did not create it, someone else used your address; nobody can sign in to it without the password chosen at sign-up.\n`,
    html:
      `<p>Hello ${escapeHtml(name)},</p><p>A Bankwright account was created with this e-mail address. <a href="${escapeHtml(link)}">Sign in</a>.</p>` +
      `<p>If you did not create it, someone else used your address; nobody can sign in to it without the password chosen at sign-up.</p>`,
  };
}

export function signUpAttemptMail(to: string, appOrigin: string): OutgoingMail {
  const link = `${appOrigin}/sign-in`;
  return {
    to,
    teamId: null,
    subject: 'Someone tried to sign up with this address',
    text:
      `Someone tried to create a Bankwright account with this e-mail address, which already has one. ` +
      `Nothing was changed and no new account was made.\n\nIf it was you, sign in at ${link}. If not, you can ignore this message.\n`,
    html:
      `<p>Someone tried to create a Bankwright account with this e-mail address, which already has one. Nothing was changed and no new account was made.</p>` +
      `<p>If it was you, <a href="${escapeHtml(link)}">sign in</a>. If not, you can ignore this message.</p>`,
  };
}
