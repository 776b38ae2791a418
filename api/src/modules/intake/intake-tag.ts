// The intake tag: a printable A6 page tied to the equipment at hand-in (pdfkit), with the tag number
// large enough to read across the bench, what was handed in, and a QR code (qrcode) that opens the
// ticket. The shipped Inter font is embedded, so the tag looks like the app and text extracts cleanly.
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import { EQUIPMENT_KIND_LABELS, SYMPTOM_LABELS, type Symptom, type EquipmentKind } from '../../contracts/tickets';

const require = createRequire(import.meta.url);
const INTER_REGULAR = require.resolve('@fontsource/inter/files/inter-latin-400-normal.woff');
const INTER_BOLD = require.resolve('@fontsource/inter/files/inter-latin-700-normal.woff');

export interface IntakeTagFacts {
  clubName: string;
  tag: string;
  ownerName: string;
  ownerCallSign: string | null;
  equipmentKind: EquipmentKind;
  makeModel: string;
  units: string[];
  serialNumber: string | null;
  accessories: string[];
  accessoriesNote: string | null;
  symptoms: Symptom[];
  /** Handed in (the ticket's creation), shown as a date in the club's time zone. */
  handedInAt: Date;
  timeZone: string;
  /** Where the QR code leads: RW_PUBLIC_URL/tickets/RW-0042. */
  link: string;
}

/** The date in the club's time zone as 2026-12-02 (ISO 8601 calendar date: no reading of 02/12 both ways). */
export function handedInDate(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

// A6 portrait in PDF points (105 × 148 mm; 1 pt = 1/72 in): ISO 216.
const PAGE: [number, number] = [297.64, 419.53];
const MARGIN = 18;

/** The intake tag as PDF bytes. */
export async function renderIntakeTag(f: IntakeTagFacts): Promise<Buffer> {
  // The QR as a PNG image in the page (error correction M: a creased paper tag still scans).
  const qr = await QRCode.toBuffer(f.link, { type: 'png', errorCorrectionLevel: 'M', margin: 2, scale: 6 });
  const doc = new PDFDocument({
    size: PAGE,
    margin: MARGIN,
    info: { Title: `Intake tag ${f.tag}`, Author: f.clubName, Subject: `${f.makeModel}, handed in ${handedInDate(f.handedInAt, f.timeZone)}`, Creator: 'Rigwright' },
  });
  doc.registerFont('Inter', INTER_REGULAR);
  doc.registerFont('Inter-Bold', INTER_BOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const width = PAGE[0] - 2 * MARGIN;
  const qrSize = 96;
  doc.font('Inter').fontSize(8.5).fillColor('#333333').text(f.clubName, MARGIN, MARGIN, { width: width - qrSize - 8 });
  doc.text('Repair bench · intake tag', { width: width - qrSize - 8 });
  doc.font('Inter-Bold').fontSize(34).fillColor('#000000').text(f.tag, MARGIN, MARGIN + 30, { width: width - qrSize - 8, lineBreak: false });
  doc.image(qr, PAGE[0] - MARGIN - qrSize, MARGIN, { width: qrSize, height: qrSize });
  doc.font('Inter').fontSize(6.5).fillColor('#333333').text('Scan to open the ticket', PAGE[0] - MARGIN - qrSize, MARGIN + qrSize + 2, { width: qrSize, align: 'center' });

  let y = MARGIN + qrSize + 18;
  const row = (label: string, value: string) => {
    doc.font('Inter-Bold').fontSize(8).fillColor('#333333').text(label, MARGIN, y, { width });
    doc.font('Inter').fontSize(10.5).fillColor('#000000').text(value, MARGIN, doc.y + 1, { width });
    y = doc.y + 6;
  };
  row('Owner', f.ownerCallSign ? `${f.ownerName} (${f.ownerCallSign})` : f.ownerName);
  row('Equipment', `${f.makeModel} · ${EQUIPMENT_KIND_LABELS[f.equipmentKind]}${f.units.length ? ` · units: ${f.units.join(', ')}` : ''}`);
  row('Serial number', f.serialNumber ?? 'not recorded');
  row('Accessories handed in', f.accessories.length ? f.accessories.join(', ') : 'none');
  if (f.accessoriesNote) row('About the accessories', f.accessoriesNote);
  if (f.symptoms.length) row('Symptoms', f.symptoms.map((s) => SYMPTOM_LABELS[s]).join('; '));
  row('Handed in', handedInDate(f.handedInAt, f.timeZone));
  doc
    .font('Inter')
    .fontSize(7)
    .fillColor('#333333')
    .text(`Keep this tag with the equipment until it is handed back. ${f.link}`, MARGIN, Math.max(y, PAGE[1] - MARGIN - 24), { width });
  doc.end();
  return done;
}
