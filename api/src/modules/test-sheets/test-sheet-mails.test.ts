import { test } from 'node:test';
import assert from 'node:assert/strict';
import { testReportMail } from './test-sheet-mails';

test('the report mail names the ticket, the sheet and the club, and says the report is attached', () => {
  const mail = testReportMail({ clubName: 'Kestrel Fen Radio Society', ownerName: 'Ada Quill', makeModel: 'Fenland FT-1', tag: 'RW-0042', number: 2, link: 'http://x/tickets/RW-0042' });
  assert.equal(mail.subject, 'Bench test passed: your Fenland FT-1 (RW-0042)');
  assert.match(mail.text, /test sheet 2/);
  assert.match(mail.text, /attached as a PDF/);
  assert.match(mail.text, /Kestrel Fen Radio Society/);
  assert.match(mail.text, /http:\/\/x\/tickets\/RW-0042/);
});
