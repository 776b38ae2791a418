// The club settings row (id 1): the board's wait limit and the board revision.
//
// board_revision is a DB-side change marker: every ticket write bumps it in its own transaction,
// so each API replica can check with one tiny read whether a board it built earlier is still
// current. Nothing about the board lives only in one process's memory.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

/** Hours a ticket may wait in one lane before its card is flagged; used when the row is missing. */
export const DEFAULT_WAIT_LIMIT_HOURS = 72;

/**
 * Bumps the board revision inside `transaction`. Call it from every write that changes what the
 * board shows (ticket intake, moves, flags; a technician's display name). It is an upsert, so it
 * also works on a database whose settings row was emptied (e.g. by a test reset).
 * Run it as the last statement of the transaction: it holds the settings row lock until commit.
 */
export async function bumpBoardRevision(sequelize: Sequelize, transaction: Transaction): Promise<void> {
  await sequelize.query(
    'INSERT INTO club_settings (id, wait_limit_hours, board_revision) VALUES (1, :hours, 1) ' +
      'ON DUPLICATE KEY UPDATE board_revision = board_revision + 1',
    { replacements: { hours: DEFAULT_WAIT_LIMIT_HOURS }, transaction },
  );
}

export interface BoardSettings {
  /** null when the settings row is missing (then nothing may be cached). */
  revision: string | null;
  waitLimitHours: number;
}

export async function readBoardSettings(sequelize: Sequelize): Promise<BoardSettings> {
  const rows = await sequelize.query<{ board_revision: string | number | bigint; wait_limit_hours: number }>(
    'SELECT board_revision, wait_limit_hours FROM club_settings WHERE id = 1',
    { type: QueryTypes.SELECT, raw: true },
  );
  const row = rows[0];
  if (!row) return { revision: null, waitLimitHours: DEFAULT_WAIT_LIMIT_HOURS };
  return { revision: String(row.board_revision), waitLimitHours: Number(row.wait_limit_hours) };
}
