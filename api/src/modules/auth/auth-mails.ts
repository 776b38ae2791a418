// The mails of the account flows: plain functions from facts to { subject, text }, so the wording
// lives in one place and is tested without a database (auth-mails.test.ts). The club's name comes
// from the club settings (club/club-settings.service.ts), never from the code.
import type { MailContent } from '../outbox/outbox.service';

/** The single-use link to choose a new password. */
export function passwordResetMail(facts: { clubName: string; displayName: string; link: string; minutes: number }): MailContent {
  return {
    subject: 'Reset your Rigwright password',
    text:
      `Hello ${facts.displayName},\n\n` +
      `Someone (we hope you) asked to reset the password of your Rigwright account at the repair bench of ${facts.clubName}.\n` +
      `Open this link within ${facts.minutes} minutes to choose a new password; it works once:\n\n${facts.link}\n\n` +
      `If you did not ask for this, ignore this mail: your password stays as it is.\n`,
  };
}
