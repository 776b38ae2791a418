// The account-flow mails' wording (auth-mails.ts), without a database. Our own design (no
// published source); these checks pin the text and that the club's name comes from the caller.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { passwordResetMail } from './auth-mails';

describe('password reset mail', () => {
  it('greets the person, names the club, the link and how long it works', () => {
    const link = 'https://bench.example.org/reset-password?token=abc_DEF-123';
    const mail = passwordResetMail({ clubName: 'Saltmarsh Amateur Radio Group', displayName: 'Tobin Marsh', link, minutes: 60 });
    assert.equal(mail.subject, 'Reset your Rigwright password');
    assert.equal(
      mail.text,
      'Hello Tobin Marsh,\n\n' +
        'Someone (we hope you) asked to reset the password of your Rigwright account at the repair bench of Saltmarsh Amateur Radio Group.\n' +
        'Open this link within 60 minutes to choose a new password; it works once:\n\n' +
        `${link}\n\n` +
        'If you did not ask for this, ignore this mail: your password stays as it is.\n',
    );
  });

  it('carries no other club than the one it is given', () => {
    const mail = passwordResetMail({ clubName: 'our club', displayName: 'Ivo', link: 'http://127.0.0.1:4300/reset-password?token=x', minutes: 15 });
    assert.match(mail.text, /at the repair bench of our club\.\n/);
    assert.match(mail.text, /within 15 minutes/);
    assert.doesNotMatch(mail.text, /Kestrel/);
  });
});
