// One migrator (table schema_migrations) and one seeder (table schema_seeds), as in umzug's
// seeders example. Migrations are listed here explicitly, in order.
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import * as m001 from './migrations/001-accounts';
import * as m002 from './migrations/002-tickets';
import * as m004 from './migrations/004-club-name';
import * as m010 from './migrations/010-firmware';
import * as m020 from './migrations/020-bench-slots';
import * as m025 from './migrations/025-ticket-events-open';
import * as m030 from './migrations/030-intake-complete';
import * as m035 from './migrations/035-diagnosis-quotes-owner-links';
import * as m050 from './migrations/050-bench-records';
import * as m055 from './migrations/055-move-undo-and-mail-grace';
import * as m060 from './migrations/060-payments';

type Step = { up(qi: QueryInterface): Promise<void>; down(qi: QueryInterface): Promise<void> };
const MIGRATIONS: [string, Step][] = [
  ['001-accounts', m001],
  ['002-tickets', m002],
  ['004-club-name', m004],
  ['010-firmware', m010],
  ['020-bench-slots', m020],
  ['025-ticket-events-open', m025],
  ['030-intake-complete', m030],
  ['035-diagnosis-quotes-owner-links', m035],
  ['050-bench-records', m050],
  ['055-move-undo-and-mail-grace', m055],
  ['060-payments', m060],
];

export function createMigrator(sequelize: Sequelize, log = false) {
  return new Umzug<QueryInterface>({
    migrations: MIGRATIONS.map(([name, step]) => ({
      name,
      up: ({ context }) => step.up(context),
      down: ({ context }) => step.down(context),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: log ? console : undefined,
  });
}

export async function migrateUp(sequelize: Sequelize, log = false): Promise<void> {
  await createMigrator(sequelize, log).up();
}
