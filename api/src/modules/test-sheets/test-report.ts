// The test report: one saved test sheet printed as a PDF (pdfkit), with the shipped Inter font.
// Same figures as the ticket page (domain/test-sheet.ts through rf.ts), every line's verdict in
// words (never colour alone), each limit's source, and the RF caution.
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import PDFDocument from 'pdfkit';
import type { TestSheet } from '../../contracts/bench-records';

const require = createRequire(import.meta.url);
// @fontsource/inter exports only CSS; its LICENSE is exported, and the font files sit beside it.
const FONT_DIR = join(dirname(require.resolve('@fontsource/inter/LICENSE')), 'files');
const REGULAR = join(FONT_DIR, 'inter-latin-400-normal.woff');
const BOLD = join(FONT_DIR, 'inter-latin-700-normal.woff');

export interface TestReportFacts {
  clubName: string;
  tag: string;
  makeModel: string;
  serialNumber: string | null;
  ownerName: string;
  sheet: TestSheet;
}

export const RF_CAUTION_LINES = [
  'Transmit only into a dummy load rated for the power and the time keyed; never into an open output.',
  'Keep clear of antennas and open transmitters while keyed: RF burns and RF exposure (follow your national exposure rules).',
  'Any test on the air needs an amateur licence; follow local codes and licensed practice.',
];

const fixed = (v: number | null, digits: number) => (v === null ? '—' : (Math.abs(v) < 0.5 * 10 ** -digits ? 0 : v).toFixed(digits));
const signed = (v: number | null, digits: number) => {
  if (v === null) return '—';
  const t = fixed(v, digits);
  return Number(t) > 0 ? `+${t}` : Number(t) === 0 ? t : t.replace('-', '−');
};

/** Renders the report; resolves to the PDF bytes. */
export function renderTestReport(facts: TestReportFacts): Promise<Buffer> {
  const { sheet } = facts;
  const doc = new PDFDocument({
    size: 'A4',
    margin: 40,
    info: { Title: `Test report ${facts.tag} sheet ${sheet.number}`, Author: `${facts.clubName} repair bench`, Creator: 'Rigwright' },
  });
  doc.registerFont('body', REGULAR);
  doc.registerFont('bold', BOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;

  doc.font('bold').fontSize(16).text(`${facts.clubName}: bench test report`);
  doc.font('body').fontSize(10).fillColor('#333');
  doc.text(`Ticket ${facts.tag}, test sheet ${sheet.number}`);
  doc.text(`${facts.makeModel}${facts.serialNumber ? `, serial ${facts.serialNumber}` : ''}; owner ${facts.ownerName}`);
  doc.text(`Tested ${sheet.at.replace('T', ' ').slice(0, 16)} UTC by ${sheet.technicianName ?? 'a technician'}`);
  if (sheet.reference) doc.text(`Frequency reference: ${sheet.reference}`);
  doc.moveDown(0.5);
  doc.font('bold').fontSize(13).fillColor('#000').text(sheet.passed ? 'Result: PASSED (every line within the club’s limits)' : 'Result: FAILED (see the lines marked FAIL)');
  doc.moveDown(0.5);

  doc.font('bold').fontSize(11).text('Supply and receive');
  doc.font('body').fontSize(10).text(`Supply voltage at the radio: ${fixed(sheet.supplyVoltageV, 2)} V    Receive current: ${fixed(sheet.receiveCurrentA, 2)} A`);
  doc.moveDown(0.5);

  // Band figures: one row per band.
  doc.font('bold').fontSize(11).text('Into the dummy load, per band');
  const cols: [string, number][] = [
    ['Band', 44],
    ['Rated W', 44],
    ['Fwd W', 44],
    ['Refl W', 40],
    ['Refl. coeff.', 52],
    ['SWR', 40],
    ['Return loss dB', 58],
    ['Mismatch dB', 52],
    ['Output dBm', 50],
    ['vs rating dB', 52],
    ['Freq. error', width - 476],
  ];
  const row = (cells: string[], font: 'body' | 'bold') => {
    const y = doc.y;
    let x = left;
    doc.font(font).fontSize(8);
    let bottom = y;
    cells.forEach((c, i) => {
      const w = cols[i]![1];
      doc.text(c, x, y, { width: w - 4 });
      bottom = Math.max(bottom, doc.y);
      x += w;
    });
    doc.x = left;
    doc.y = bottom + 3;
  };
  row(cols.map((c) => c[0]), 'bold');
  for (const b of sheet.bands) {
    row(
      [
        b.band,
        fixed(b.ratedW, 1),
        fixed(b.forwardW, 1),
        fixed(b.reflectedW, 2),
        fixed(b.reflectionCoefficient, 3),
        `${fixed(b.swr, 2)}:1`,
        b.returnLossDb === null ? 'no reflection' : fixed(b.returnLossDb, 2),
        fixed(b.mismatchLossDb, 3),
        fixed(b.forwardDbm, 2),
        signed(b.powerErrorDb, 2),
        b.frequencyErrorHz === null ? 'not measured' : `${signed(b.frequencyErrorHz, 0)} Hz, ${signed(b.frequencyErrorPpm, 2)} ppm`,
      ],
      'body',
    );
  }
  doc.moveDown(0.5);

  doc.font('bold').fontSize(11).text('Each line against the club’s limits', left);
  for (const c of sheet.checks) {
    doc.font('bold').fontSize(9).text(`${c.passed ? 'PASS' : 'FAIL'}  ${c.line}: ${c.shown} (limit ${c.limit})`, left, doc.y, { width });
    doc.font('body').fontSize(8).fillColor('#444').text(`Source: ${c.source}`, left + 28, doc.y, { width: width - 28 });
    doc.fillColor('#000');
  }
  if (sheet.notes) {
    doc.moveDown(0.5);
    doc.font('bold').fontSize(11).text('Notes', left);
    doc.font('body').fontSize(9).text(sheet.notes, { width });
  }

  doc.moveDown(0.8);
  const boxTop = doc.y;
  doc.font('bold').fontSize(10).text('Caution: RF power on the bench', left + 10, boxTop + 8, { width: width - 20 });
  doc.font('body').fontSize(9);
  for (const line of RF_CAUTION_LINES) doc.text(`• ${line}`, left + 10, doc.y, { width: width - 20 });
  const boxBottom = doc.y + 8;
  doc.rect(left, boxTop, width, boxBottom - boxTop).lineWidth(1).strokeColor('#b45309').stroke();
  doc.y = boxBottom + 8;
  doc.x = left;
  doc.font('body').fontSize(8).fillColor('#444').text(
    'Figures from forward and reflected power: reflection coefficient sqrt(Pr/Pf), SWR (1+G)/(1−G), return loss 10 log10 (Pf/Pr), mismatch loss −10 log10 (1 − Pr/Pf); output is the forward reading.',
    { width },
  );
  doc.end();
  return done;
}
