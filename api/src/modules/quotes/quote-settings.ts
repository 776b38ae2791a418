// The club's currency and approval threshold: columns of the club_settings row (id 1,
// db/migrations/035), read on each request so every API replica sees a change at once.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { QuoteSettings } from '../../contracts/owner-records';

/** The migration's defaults: pounds sterling, approval above £50.00. */
export const DEFAULT_QUOTE_SETTINGS: QuoteSettings = { currency: 'GBP', approvalThresholdMinor: 5000 };

export async function readQuoteSettings(sequelize: Sequelize, transaction?: Transaction): Promise<QuoteSettings> {
  const rows = await sequelize.query<{ currency_code: string; approval_threshold_minor: string | number }>(
    'SELECT currency_code, approval_threshold_minor FROM club_settings WHERE id = 1',
    { type: QueryTypes.SELECT, transaction },
  );
  const row = rows[0];
  if (!row) return { ...DEFAULT_QUOTE_SETTINGS };
  return { currency: row.currency_code, approvalThresholdMinor: Number(row.approval_threshold_minor) };
}

export async function updateQuoteSettings(sequelize: Sequelize, patch: Partial<QuoteSettings>): Promise<QuoteSettings> {
  const next = { ...(await readQuoteSettings(sequelize)), ...patch };
  // An upsert, so it also works when the settings row was emptied (a test reset).
  await sequelize.query(
    'INSERT INTO club_settings (id, currency_code, approval_threshold_minor) VALUES (1, :currency, :threshold) ' +
      'ON DUPLICATE KEY UPDATE currency_code = VALUES(currency_code), approval_threshold_minor = VALUES(approval_threshold_minor)',
    { replacements: { currency: next.currency, threshold: next.approvalThresholdMinor } },
  );
  return next;
}
