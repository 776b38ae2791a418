// Seeder: the demo club's fee schedule (GBP, member and non-member rates, in force from the start
// of the year; the labour rate rises on 1 April) and charges on the demo tickets that have reached
// the bench test and return lanes, so that balances show on the board and the ticket pages.
// Amounts are integer pence. Invented figures.
import { QueryTypes, type Sequelize } from 'sequelize';

const YEAR = new Date().getUTCFullYear();
const ITEMS: [code: string, name: string, unit: 'each' | 'hour', prices: [from: string, member: number, nonMember: number][]][] = [
  ['bench_session', 'Bench session', 'each', [[`${YEAR}-01-01`, 300, 500]]],
  ['diagnosis', 'Diagnosis', 'each', [[`${YEAR}-01-01`, 500, 800]]],
  ['reflash', 'Firmware reflash', 'each', [[`${YEAR}-01-01`, 800, 1200]]],
  ['labour', 'Labour', 'hour', [[`${YEAR}-01-01`, 1000, 1500], [`${YEAR}-04-01`, 1200, 1800]]],
];

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  const now = new Date();
  await sequelize.transaction(async (transaction) => {
    const ids: Record<string, number> = {};
    for (const [code, name, unit, prices] of ITEMS) {
      const [id] = await sequelize.query('INSERT INTO fee_items (code, name, unit, created_at) VALUES (:code, :name, :unit, :now)', {
        replacements: { code, name, unit, now },
        type: QueryTypes.INSERT,
        transaction,
      });
      ids[code] = Number(id);
      for (const [from, member, nonMember] of prices) {
        await sequelize.query(
          'INSERT INTO fee_prices (fee_item_id, effective_from, member_price, non_member_price, created_by, created_at) VALUES (:id, :from, :member, :nonMember, NULL, :now)',
          { replacements: { id, from, member, nonMember, now }, transaction },
        );
      }
    }
    const tickets = await sequelize.query<{ id: number; member: number }>(
      `SELECT t.id, EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = t.owner_user_id AND r.role = 'member') AS member
       FROM tickets t WHERE t.state IN ('bench_test', 'return') ORDER BY t.id`,
      { type: QueryTypes.SELECT, transaction },
    );
    const month = now.toISOString().slice(0, 7);
    const labour = now.toISOString().slice(0, 10) >= `${YEAR}-04-01` ? [1200, 1800] : [1000, 1500];
    for (const t of tickets) {
      const isMember = Number(t.member) === 1;
      const lines: [number | null, string, number, number][] = [
        [ids.diagnosis!, 'Diagnosis', 1, isMember ? 500 : 800],
        [ids.labour!, 'Labour', 1, isMember ? labour[0]! : labour[1]!],
        [null, 'Fuse, 25 A blade', 1, 65],
      ];
      for (const [feeItemId, description, quantity, unit] of lines) {
        await sequelize.query(
          `INSERT INTO charges (ticket_id, booking_id, fee_item_id, description, quantity, unit_amount, amount, member_rate, ledger_month, created_by, created_at)
           VALUES (:ticketId, NULL, :feeItemId, :description, :quantity, :unit, :amount, :member, :month, NULL, :now)`,
          { replacements: { ticketId: t.id, feeItemId, description, quantity, unit, amount: unit * quantity, member: isMember, month, now }, transaction },
        );
      }
    }
  });
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  // Seeded charges have no author; charges people made since keep their items (the delete then refuses).
  await sequelize.query('DELETE FROM charges WHERE created_by IS NULL AND id NOT IN (SELECT charge_id FROM payment_allocations) AND id NOT IN (SELECT charge_id FROM waivers)');
  await sequelize.query('DELETE FROM fee_prices');
  await sequelize.query('DELETE FROM fee_items');
}
