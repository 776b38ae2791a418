// Club-wide settings that services read: for now the club's name (mail text, the mail sender,
// the password policy's club words).
import type { Transaction } from 'sequelize';
import { ClubSettings } from './club-settings.model';

/** The name used when the settings row gives none (the column default of db/migrations/004-club-name.ts). */
export const DEFAULT_CLUB_NAME = 'our club';

/** The club's name from the settings row; the migration's default when the row is missing. */
export async function readClubName(transaction?: Transaction): Promise<string> {
  const row = await ClubSettings.findByPk(1, { attributes: ['clubName'], transaction });
  return row?.clubName?.trim() || DEFAULT_CLUB_NAME;
}
