// The club's name in the club settings row. Mail text, the mail sender and the password policy's
// club-specific words read it from here, so no club is written into the code. A new installation
// starts with a neutral name; the demo seeder sets the demo club's.
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.addColumn('club_settings', 'club_name', {
    type: DataTypes.STRING(100),
    allowNull: false,
    // Same words as DEFAULT_CLUB_NAME in api/src/modules/club/club-settings.service.ts (a migration
    // keeps its own copy: it must not change when the code does).
    defaultValue: 'our club',
  });
}

export async function down(qi: QueryInterface): Promise<void> {
  // Not qi.removeColumn: on the mariadb dialect (Sequelize 6.37, mariadb 3.5) its foreign-key lookup
  // fails with "Cannot delete property 'meta' of [object Array]".
  await qi.sequelize.query('ALTER TABLE club_settings DROP COLUMN club_name');
}
