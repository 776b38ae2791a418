// Seeder: the demo club's name in the club settings row (db/migrations/004-club-name.ts), so its
// mail is signed and sent by "Kestrel Fen Radio Society" and its words are refused as passwords.
import type { Sequelize } from 'sequelize';
import { DEMO_CLUB_NAME } from './demo-club';

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query(
    'INSERT INTO club_settings (id, club_name) VALUES (1, :name) ON DUPLICATE KEY UPDATE club_name = VALUES(club_name)',
    { replacements: { name: DEMO_CLUB_NAME } },
  );
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query("UPDATE club_settings SET club_name = DEFAULT(club_name) WHERE id = 1 AND club_name = :name", {
    replacements: { name: DEMO_CLUB_NAME },
  });
}
