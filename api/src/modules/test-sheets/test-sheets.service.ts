// Test sheets (Bench test lane): readings saved with the club's limits of the day, judged line by
// line through domain/test-sheet.ts, printed as a PDF report. A passed sheet releases Bench test →
// Return and mails the report to the owner (when they asked for e-mail). A failed sheet sends the
// ticket to Repair: once the sheet is committed, the service makes that move through the same
// moveTicket as a drag on the board (so its event, mail and version check are the move's own),
// with the sheet's failed lines as the move's note. If the move cannot be made (someone moved the
// ticket meanwhile), the sheet stays saved and the answer says why.
import type { AppDeps } from '../../deps';
import { AppError, NotFoundError, RuleError, ValidationError } from '../../errors';
import { CalcInputError } from '../../domain/input-error';
import { evaluateTestSheet, type TestLimits } from '../../domain/test-sheet';
import type { TestSheet, TestSheetSaved, TestSheetsView } from '../../contracts/bench-records';
import type { SessionUser } from '../auth/session-user';
import { bumpBoardRevision } from '../board/board-revision';
import { readClubName } from '../club/club-settings.service';
import { enqueueMail } from '../outbox/outbox.service';
import { findBenchTicket } from '../repair/bench-ticket';
import { TicketEvent, type Ticket } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { moveTicket } from '../tickets/tickets.service';
import { renderTestReport } from './test-report';
import { testReportMail } from './test-sheet-mails';
import { TestSheetRow } from './test-sheet.model';
import type { TestSheetBody, TestSheetListQuery } from './test-sheets.schemas';
import { readTestLimits } from './test-limits.service';

export type TestSheetDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

function recordRefusal(ticket: Pick<Ticket, 'state'>): string | null {
  return ticket.state === 'bench_test' ? null : 'Test sheets are recorded while the ticket is in the Bench test lane. Move it to Bench test first.';
}

/** The sheet as the API shows it: every figure and line recomputed from the readings and the limits stored with it. */
function toSheet(row: TestSheetRow, tag: string): TestSheet {
  const result = evaluateTestSheet({ supplyVoltageV: Number(row.supplyVoltageV), receiveCurrentA: Number(row.receiveCurrentA), bands: row.bands }, row.limits);
  return {
    id: row.id,
    number: row.number,
    passed: !!row.passed,
    supplyVoltageV: Number(row.supplyVoltageV),
    receiveCurrentA: Number(row.receiveCurrentA),
    reference: row.reference,
    notes: row.notes,
    bands: row.bands.map((b, i) => ({ ...b, ...result.bands[i]! })),
    checks: result.checks,
    limits: row.limits,
    technicianName: row.technician?.displayName ?? null,
    at: iso(row.createdAt),
    reportUrl: `/api/tickets/${tag}/test-sheets/${row.id}/report.pdf`,
  };
}

/** The ticket's sheets, newest first by default (the owner may read their own ticket's). */
export async function listTestSheets(deps: TestSheetDeps, user: SessionUser, tag: string, query: TestSheetListQuery): Promise<TestSheetsView> {
  const ticket = await findBenchTicket(user, tag);
  const canonical = formatTag(ticket.id);
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const [{ rows, count }, latest] = await Promise.all([
    TestSheetRow.findAndCountAll({
      where: { ticketId: ticket.id },
      include: [{ association: 'technician', attributes: ['id', 'displayName'] }],
      order: [['number', dir]],
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
    }),
    TestSheetRow.findOne({ where: { ticketId: ticket.id }, attributes: ['passed'], order: [['number', 'DESC']] }),
  ]);
  const refusal = recordRefusal(ticket);
  return {
    tag: canonical,
    canRecord: !refusal,
    reason: refusal,
    latestPassed: latest ? !!latest.passed : null,
    sheets: { items: rows.map((r) => toSheet(r, canonical)), total: count, page: query.page, pageSize: query.pageSize },
  };
}

/** Judges the readings against `limits`, answering 400 with the field at fault for readings that cannot be. */
function judge(body: TestSheetBody, limits: TestLimits) {
  try {
    return evaluateTestSheet(body, limits);
  } catch (err) {
    if (err instanceof CalcInputError) throw new ValidationError(err.message, { [err.field]: err.message });
    throw err;
  }
}

/** Saves a sheet (technicians, Bench test lane); see the file's comment for what follows. */
export async function saveTestSheet(deps: TestSheetDeps, user: SessionUser, tag: string, body: TestSheetBody): Promise<TestSheetSaved> {
  const { sequelize, clock } = deps;
  let mailed = false;
  const saved = await sequelize.transaction(async (transaction) => {
    const ticket = await findBenchTicket(user, tag, transaction, true);
    const refusal = recordRefusal(ticket);
    if (refusal) throw new RuleError('not_in_bench_test', refusal);
    const { limits } = await readTestLimits(transaction);
    const result = judge(body, limits);
    const last = await TestSheetRow.max<number | null, TestSheetRow>('number', { where: { ticketId: ticket.id }, transaction });
    const now = clock();
    const row = await TestSheetRow.create(
      {
        ticketId: ticket.id,
        number: Number(last ?? 0) + 1,
        supplyVoltageV: body.supplyVoltageV,
        receiveCurrentA: body.receiveCurrentA,
        bands: body.bands.map((b) => ({
          band: b.band,
          ratedW: b.ratedW,
          forwardW: b.forwardW,
          reflectedW: b.reflectedW,
          nominalHz: b.nominalHz ?? null,
          measuredHz: b.measuredHz ?? null,
        })),
        limits,
        reference: body.reference ?? null,
        notes: body.notes ?? null,
        passed: result.passed,
        technicianId: user.id,
        createdAt: now,
      },
      { transaction },
    );
    const failedLines = result.checks.filter((c) => !c.passed).map((c) => `${c.line} ${c.shown} (limit ${c.limit})`);
    const summary = result.passed
      ? `Test sheet ${row.number} passed: ${result.checks.length} lines within the club's limits.`
      : `Test sheet ${row.number} failed: ${failedLines.join('; ')}.`;
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'test_sheet', fromState: null, toState: null, note: summary, ownerVisible: true, createdAt: now },
      { transaction },
    );
    const canonical = formatTag(ticket.id);
    const sheet = toSheet(Object.assign(row, { technician: { displayName: user.displayName } }) as TestSheetRow, canonical);
    if (result.passed && ticket.notifyByEmail && ticket.ownerEmail) {
      const clubName = await readClubName(transaction);
      const pdf = await renderTestReport({ clubName, tag: canonical, makeModel: ticket.makeModel, serialNumber: ticket.serialNumber, ownerName: ticket.ownerName, sheet });
      const link = `${deps.config.RW_PUBLIC_URL.replace(/\/$/, '')}/tickets/${canonical}`;
      const mail = testReportMail({ clubName, ownerName: ticket.ownerName, makeModel: ticket.makeModel, tag: canonical, number: row.number, link });
      await enqueueMail(
        transaction,
        { kind: 'test_report', to: ticket.ownerEmail, ticketId: ticket.id, ...mail, attachment: { name: `${canonical}-test-sheet-${row.number}.pdf`, contentType: 'application/pdf', content: pdf } },
        now,
      );
      mailed = true;
    }
    // The board's "Test failed" flag follows the latest sheet.
    await bumpBoardRevision(sequelize, transaction);
    return { sheet, version: ticket.version, summary, tag: canonical };
  });

  let movedTo: TestSheetSaved['movedTo'] = null;
  let moveRefused: string | null = null;
  if (!saved.sheet.passed) {
    try {
      await moveTicket(deps, user, { tag: saved.tag, to: 'repair', version: saved.version, note: saved.summary.slice(0, 1000) });
      movedTo = 'repair';
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      moveRefused = `The sheet is saved, but the ticket was not moved to Repair: ${err.message}`;
    }
  }
  return { sheet: saved.sheet, movedTo, moveRefused, mailed };
}

/** The report of one sheet as PDF bytes (anyone who may see the ticket). */
export async function testReportPdf(deps: TestSheetDeps, user: SessionUser, tag: string, sheetId: number): Promise<{ pdf: Buffer; fileName: string }> {
  const ticket = await findBenchTicket(user, tag);
  const canonical = formatTag(ticket.id);
  const row = await TestSheetRow.findOne({ where: { id: sheetId, ticketId: ticket.id }, include: [{ association: 'technician', attributes: ['id', 'displayName'] }] });
  if (!row) throw new NotFoundError(`There is no test sheet ${sheetId} on ${canonical}.`, 'test_sheet_not_found');
  const sheet = toSheet(row, canonical);
  const pdf = await renderTestReport({
    clubName: await readClubName(),
    tag: canonical,
    makeModel: ticket.makeModel,
    serialNumber: ticket.serialNumber,
    ownerName: ticket.ownerName,
    sheet,
  });
  return { pdf, fileName: `${canonical}-test-sheet-${row.number}.pdf` };
}
