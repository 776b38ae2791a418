// The owner's mails: the approval link, the status link and the note text, nothing else.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { ownerNoteMail, quoteApprovalMail } from './owner-mails';
import { ticketMovedMail } from '../tickets/ticket-mails';

const facts = { clubName: 'Kestrel Fen Radio Society', ownerName: 'Wren Tallis', makeModel: 'Q-Series HF transceiver', tag: 'RW-0042', statusLink: 'http://bench.example/owner/status/RW-0042/s' };

test('the approval mail carries the total, the lines, the approval link and what declining means', () => {
  const mail = quoteApprovalMail({ ...facts, total: '£71.50', lines: ['Diagnosis: 1 × £15.00 = £15.00'], note: null, approvalLink: 'http://bench.example/owner/approve/RW-0042/a', expiresDays: 30 });
  assert.equal(mail.subject, 'Quote for your Q-Series HF transceiver (RW-0042): £71.50, your approval needed');
  assert.match(mail.text, /comes to £71\.50:\n {2}- Diagnosis: 1 × £15\.00 = £15\.00/);
  assert.match(mail.text, /\/owner\/approve\/RW-0042\/a\n/);
  assert.match(mail.text, /works once, for 30 days/);
  assert.match(mail.text, /goes back to you unrepaired/);
  assert.match(mail.text, /Kestrel Fen Radio Society$/);
});

test('the note mail carries the note and the status link', () => {
  const mail = ownerNoteMail({ ...facts, text: 'A reflash should cure it.' });
  assert.match(mail.text, /\n\nA reflash should cure it\.\n\n/);
  assert.match(mail.text, /\/owner\/status\/RW-0042\/s/);
});

test('ticket mails offer the status link when one is given', () => {
  const mail = ticketMovedMail({ ...facts, link: 'http://bench.example/tickets/RW-0042', from: 'Intake', to: 'Diagnosis' });
  assert.match(mail.text, /no account needed: http:\/\/bench\.example\/owner\/status\/RW-0042\/s\nMembers can also sign in: http:\/\/bench\.example\/tickets\/RW-0042/);
  const without = ticketMovedMail({ ...facts, statusLink: undefined, link: 'http://bench.example/tickets/RW-0042', from: 'Intake', to: 'Diagnosis' });
  assert.match(without.text, /Follow it here: http:\/\/bench\.example\/tickets\/RW-0042/);
});
