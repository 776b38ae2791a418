// Receipts: the e-mail text (a plain template, like the other modules' mail files) and the PDF.
// The PDF embeds the shipped Inter font (pdfkit's built-in Helvetica has no glyph for every
// character a name may hold), and says the same things as the mail.
import PDFDocument from 'pdfkit';
import { createRequire } from 'node:module';
import type { MailContent } from '../outbox/outbox.service';

export interface ReceiptFacts {
  clubName: string;
  ownerName: string;
  tag: string;
  amount: string;
  method: string;
  receiptNumber: string;
  paidAt: string;
  link: string;
}

export function receiptMail(f: ReceiptFacts): MailContent {
  return {
    subject: `Receipt ${f.receiptNumber}: ${f.amount} for ${f.tag}`,
    text: [
      `Hello ${f.ownerName},`,
      '',
      `Thank you: ${f.clubName} received ${f.amount} ${f.method} on ${f.paidAt} for ticket ${f.tag}.`,
      `Receipt number: ${f.receiptNumber}`,
      '',
      `The ticket, its charges and a printable receipt: ${f.link}`,
      '',
      `${f.clubName} repair bench`,
    ].join('\n'),
  };
}

const require = createRequire(import.meta.url);

function font(weight: 400 | 600): string {
  return require.resolve(`@fontsource/inter/files/inter-latin-${weight}-normal.woff`);
}

export interface ReceiptPdfFacts extends ReceiptFacts {
  lines: { description: string; amount: string }[];
  refunded: string | null;
}

/** The receipt as a PDF document (bytes). */
export function receiptPdf(f: ReceiptPdfFacts): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', margin: 56, info: { Title: `Receipt ${f.receiptNumber}`, Author: f.clubName } });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.registerFont('body', font(400));
    doc.registerFont('bold', font(600));
    doc.font('bold').fontSize(20).text(f.clubName);
    doc.font('body').fontSize(11).text('Repair bench');
    doc.moveDown(1.5);
    doc.font('bold').fontSize(16).text(`Receipt ${f.receiptNumber}`);
    doc.moveDown(0.5);
    doc.font('body').fontSize(11);
    doc.text(`Received from: ${f.ownerName}`);
    doc.text(`Ticket: ${f.tag}`);
    doc.text(`Date: ${f.paidAt}`);
    doc.text(`Paid ${f.method}`);
    doc.moveDown();
    if (f.lines.length) {
      doc.font('bold').text('Towards');
      doc.font('body');
      for (const l of f.lines) doc.text(`${l.description}   ${l.amount}`);
      doc.moveDown();
    }
    doc.font('bold').fontSize(14).text(`Amount received: ${f.amount}`);
    if (f.refunded) doc.font('body').fontSize(11).text(`Refunded since: ${f.refunded}`);
    doc.end();
  });
}
