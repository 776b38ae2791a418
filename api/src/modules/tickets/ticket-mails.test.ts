// The ticket mails' wording (ticket-mails.ts), without a database. The texts are our own design
// (no published source); these checks pin them and that the club's name comes from the caller.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ticketMovedMail, ticketOpenedMail } from './ticket-mails';

const facts = {
  clubName: 'Saltmarsh Amateur Radio Group',
  ownerName: 'Perrin Sallow',
  makeModel: 'Fenwick Heron 100 HF transceiver',
  tag: 'RW-0042',
  link: 'https://bench.example.org/tickets/RW-0042',
};

describe('ticket mails', () => {
  it('the opened mail names the tag, the equipment, serial and accessories, the fault, the link and the club', () => {
    const mail = ticketOpenedMail({
      ...facts,
      faultReported: 'Display dark after a power cut.',
      symptoms: ['Relay clicks, no display'],
      serialNumber: 'FH100-20931',
      units: ['display head', 'main body'],
      accessories: ['Control cable', 'Microphone'],
      accessoriesNote: 'Mic cord taped near the plug.',
    });
    assert.equal(mail.subject, 'Ticket RW-0042 opened');
    assert.equal(
      mail.text,
      [
        'Hello Perrin Sallow,',
        '',
        'Your Fenwick Heron 100 HF transceiver has been handed in at the bench as ticket RW-0042.',
        '',
        'Equipment: Fenwick Heron 100 HF transceiver (display head, main body)',
        'Serial number: FH100-20931',
        'Accessories handed in: Control cable, Microphone',
        'About the accessories: Mic cord taped near the plug.',
        'Symptoms: Relay clicks, no display',
        'Fault as reported: Display dark after a power cut.',
        '',
        'If anything above is wrong or missing, tell the bench when you quote the tag number.',
        'Quote RW-0042 when you ask about it. You will get an e-mail each time it moves on.',
        'Follow it here: https://bench.example.org/tickets/RW-0042',
        '',
        'Rigwright, the repair bench of Saltmarsh Amateur Radio Group',
      ].join('\n'),
    );
  });

  it('the opened mail says so when no serial or accessories were recorded', () => {
    const mail = ticketOpenedMail({ ...facts, faultReported: 'No power.', symptoms: [], serialNumber: null, units: [], accessories: [], accessoriesNote: null });
    assert.match(mail.text, /^Equipment: Fenwick Heron 100 HF transceiver$/m);
    assert.match(mail.text, /^Serial number: not recorded$/m);
    assert.match(mail.text, /^Accessories handed in: nothing besides the equipment$/m);
    assert.doesNotMatch(mail.text, /Symptoms:|About the accessories/);
  });

  it('the moved mail names both lanes in its text and the new lane in its subject', () => {
    const mail = ticketMovedMail({ ...facts, from: 'Intake', to: 'Diagnosis' });
    assert.equal(mail.subject, 'Your Fenwick Heron 100 HF transceiver (RW-0042) has moved to Diagnosis');
    assert.equal(
      mail.text,
      [
        'Hello Perrin Sallow,',
        '',
        'Your Fenwick Heron 100 HF transceiver (ticket RW-0042) has moved from Intake to Diagnosis.',
        'Follow it here: https://bench.example.org/tickets/RW-0042',
        '',
        'Rigwright, the repair bench of Saltmarsh Amateur Radio Group',
      ].join('\n'),
    );
  });

  it('carries no other club than the one it is given', () => {
    for (const mail of [ticketOpenedMail({ ...facts, clubName: 'our club', faultReported: 'Hum.', symptoms: [], serialNumber: null, units: [], accessories: [], accessoriesNote: null }), ticketMovedMail({ ...facts, clubName: 'our club', from: 'Repair', to: 'Bench test' })]) {
      assert.match(mail.text, /the repair bench of our club$/);
      assert.doesNotMatch(mail.text + mail.subject, /Kestrel|Saltmarsh/);
    }
  });
});
