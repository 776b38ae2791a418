// The demo club seeder, as in umzug's seeders example: its own Umzug with its own storage table
// (schema_seeds), so running the start command twice seeds once.
//
//   node --import tsx db/seed.ts                  migrate if needed, then seed the demo club
//   node --import tsx db/seed.ts --board-load N   demo accounts only, then N open tickets (benchmark)
//   node --import tsx db/seed.ts down             undo the last seeder
//
// Demo sign-ins (all @kestrelfen.example): admin / bench-demo-admin, tech / bench-demo-tech,
// tech2 / bench-demo-tech2, treasurer / bench-demo-treasurer, member / bench-demo-member.
// The other members get random passwords that nobody knows.
import { SequelizeStorage, Umzug } from 'umzug';
import type { Sequelize } from 'sequelize';
import { loadConfig } from '../api/src/config';
import { createSequelize } from '../api/src/db';
import { migrateUp } from './migrator';
import * as s001 from './seeders/001-demo-accounts';
import * as s002 from './seeders/002-demo-tickets';
import * as s003 from './seeders/003-demo-club-settings';
import { DEMO_CLUB_NAME } from './seeders/demo-club';
import * as s004 from './seeders/004-demo-firmware';
import * as s020 from './seeders/020-demo-benches';
import * as s060 from './seeders/060-demo-fees';
import { seedBoardLoad } from './seeders/board-load';

export { seedBoardLoad };

type Seed = { up(p: { context: Sequelize }): Promise<void>; down(p: { context: Sequelize }): Promise<void> };
const SEEDERS: [string, Seed][] = [
  ['001-demo-accounts', s001],
  ['002-demo-tickets', s002],
  ['003-demo-club-settings', s003],
  ['004-demo-firmware', s004],
  ['020-demo-benches', s020],
  ['060-demo-fees', s060],
];

export function createSeeder(sequelize: Sequelize, log = false) {
  return new Umzug<Sequelize>({
    migrations: SEEDERS.map(([name, seed]) => ({
      name,
      up: ({ context }) => seed.up({ context }),
      down: ({ context }) => seed.down({ context }),
    })),
    context: sequelize,
    // Its own model name too: SequelizeStorage defaults to 'SequelizeMeta', which the migrator's storage
    // already defines on this connection (the seeds would land in schema_migrations).
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_seeds', modelName: 'SchemaSeed' }),
    logger: log ? console : undefined,
  });
}

async function main(args: string[]): Promise<void> {
  const config = loadConfig();
  const sequelize = createSequelize(config);
  try {
    await migrateUp(sequelize);
    const seeder = createSeeder(sequelize);
    if (args[0] === 'down') {
      const undone = await seeder.down();
      console.log(undone.length ? `Undid seeder ${undone.map((s) => s.name).join(', ')}.` : 'No seeder to undo.');
      return;
    }
    const loadIndex = args.indexOf('--board-load');
    if (loadIndex >= 0) {
      const n = Number(args[loadIndex + 1]);
      if (!Number.isInteger(n) || n < 0) throw new Error('--board-load needs a whole number of tickets.');
      await seeder.up({ to: '001-demo-accounts' });
      await seedBoardLoad(sequelize, n);
      console.log(`Seeded the demo accounts and ${n} open tickets for the board benchmark in ${config.RW_DB_NAME}.`);
      return;
    }
    const done = await seeder.up();
    console.log(
      done.length
        ? `Seeded the demo club ${DEMO_CLUB_NAME} in ${config.RW_DB_NAME} (${done.map((s) => s.name).join(', ')}).`
        : `The demo club is already seeded in ${config.RW_DB_NAME}; nothing to do.`,
    );
  } finally {
    await sequelize.close();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main(process.argv.slice(2)).catch((err) => {
    console.error(`Seeding failed: ${(err as Error).message}`);
    process.exit(1);
  });
}
