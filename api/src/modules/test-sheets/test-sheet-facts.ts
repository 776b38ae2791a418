// The facts the workflow guards read from test sheets (tickets.service recordedFactsOf): whether
// the ticket's latest sheet passed or failed. A leaf module, so the tickets service can import it
// without importing the test-sheet service (which itself moves tickets).
import type { Transaction } from 'sequelize';
import { TestSheetRow } from './test-sheet.model';

/** The latest sheet's verdict: true passed, false failed, null no sheet yet. */
export async function latestTestSheetPassed(ticketId: number, transaction?: Transaction): Promise<boolean | null> {
  const latest = await TestSheetRow.findOne({ where: { ticketId }, attributes: ['passed'], order: [['number', 'DESC']], transaction });
  return latest ? !!latest.passed : null;
}

export async function testSheetFacts(ticketId: number, transaction?: Transaction): Promise<{ hasPassedTestSheet: boolean; hasFailedTestSheet: boolean }> {
  const passed = await latestTestSheetPassed(ticketId, transaction);
  return { hasPassedTestSheet: passed === true, hasFailedTestSheet: passed === false };
}
