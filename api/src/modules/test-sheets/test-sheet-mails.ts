// The mail that carries a passed test sheet's report to the owner (the PDF is attached).
import type { MailContent } from '../outbox/outbox.service';

export interface TestReportMailFacts {
  clubName: string;
  ownerName: string;
  makeModel: string;
  tag: string;
  number: number;
  link: string;
}

export function testReportMail(facts: TestReportMailFacts): MailContent {
  return {
    subject: `Bench test passed: your ${facts.makeModel} (${facts.tag})`,
    text: [
      `Hello ${facts.ownerName},`,
      '',
      `Your ${facts.makeModel} (ticket ${facts.tag}) has passed its bench test (test sheet ${facts.number}).`,
      'The test report is attached as a PDF: power into a dummy load, SWR, supply and receive current and',
      'frequency error, each against the club’s limits.',
      '',
      `Follow the ticket here: ${facts.link}`,
      '',
      `Rigwright, the repair bench of ${facts.clubName}`,
    ].join('\n'),
  };
}
