// Seeder: the demo club's accounts (one per role, a second technician, and members).
import { randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { loadConfig } from '../../api/src/config';
import { argon2ParamsFromConfig, hashPassword, passwordProblem } from '../../api/src/modules/auth/passwords';
import { DEMO_ACCOUNTS, DEMO_CLUB_NAME } from './demo-club';

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  const params = argon2ParamsFromConfig(loadConfig());
  const now = new Date();
  for (const account of DEMO_ACCOUNTS) {
    const existing = await sequelize.query<{ id: number }>('SELECT id FROM users WHERE email = :email', {
      replacements: { email: account.email },
      type: QueryTypes.SELECT,
    });
    if (existing.length > 0) continue; // someone registered it by hand: leave it alone
    if (account.password) {
      // The documented demo passwords must pass the same policy as any other password.
      const problem = passwordProblem(account.password, { ...account, clubName: DEMO_CLUB_NAME });
      if (problem) throw new Error(`Demo password for ${account.email} is refused by the policy: ${problem}`);
    }
    const passwordHash = await hashPassword(account.password ?? randomBytes(24).toString('base64url'), params);
    await sequelize.transaction(async (transaction) => {
      const [id] = await sequelize.query(
        'INSERT INTO users (email, display_name, call_sign, password_hash, session_generation, disabled, created_at, updated_at) ' +
          'VALUES (:email, :displayName, :callSign, :passwordHash, 0, false, :now, :now)',
        { replacements: { ...account, passwordHash, now }, type: QueryTypes.INSERT, transaction },
      );
      for (const role of account.roles) {
        await sequelize.query('INSERT INTO user_roles (user_id, role) VALUES (:id, :role)', {
          replacements: { id, role },
          type: QueryTypes.INSERT,
          transaction,
        });
      }
    });
  }
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query('DELETE FROM users WHERE email IN (:emails)', {
    replacements: { emails: DEMO_ACCOUNTS.map((a) => a.email) },
  });
}
