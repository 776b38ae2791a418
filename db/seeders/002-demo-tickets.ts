// Seeder: about twenty demo tickets over every lane (and two closed), with their timelines.
// Times are relative to the moment of seeding: from an hour to two weeks old. No mail is queued.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { bumpBoardRevision } from '../../api/src/modules/board/board-revision';
import { DEMO_ACCOUNTS, DEMO_TICKETS, type DemoTicket } from './demo-club';

const HOUR = 3_600_000;

async function userIds(sequelize: Sequelize, transaction: Transaction): Promise<Map<string, { id: number; name: string; callSign: string | null }>> {
  const rows = await sequelize.query<{ id: number; email: string; display_name: string; call_sign: string | null }>(
    'SELECT id, email, display_name, call_sign FROM users WHERE email IN (:emails)',
    { replacements: { emails: DEMO_ACCOUNTS.map((a) => a.email) }, type: QueryTypes.SELECT, transaction },
  );
  return new Map(rows.map((r) => [r.email, { id: r.id, name: r.display_name, callSign: r.call_sign }]));
}

/** Spreads the moves between hand-in and the last move, so the timeline reads in order. */
function moveTimes(t: DemoTicket, now: number): number[] {
  const openedAt = now - t.ageHours * HOUR;
  const lastAt = now - t.inStateHours * HOUR;
  const n = t.path.length;
  return t.path.map((_, i) => (i === n - 1 ? lastAt : openedAt + ((lastAt - openedAt) * (i + 1)) / n));
}

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  const now = Date.now();
  await sequelize.transaction(async (transaction) => {
    const users = await userIds(sequelize, transaction);
    const receptionist = users.get('tech@kestrelfen.example')?.id ?? null;
    for (const t of DEMO_TICKETS) {
      const account = typeof t.owner === 'string' ? users.get(t.owner) : undefined;
      const owner =
        typeof t.owner === 'string'
          ? { userId: account?.id ?? null, name: account?.name ?? t.owner, email: t.owner, phone: null, callSign: account?.callSign ?? null }
          : { userId: null, ...t.owner };
      const openedAt = new Date(now - t.ageHours * HOUR);
      const times = moveTimes(t, now);
      const state = t.path.at(-1) ?? 'intake';
      const stateSince = new Date(times.at(-1) ?? openedAt.getTime());
      const technicianId = t.technician ? (users.get(t.technician)?.id ?? null) : null;
      const [ticketId] = await sequelize.query(
        'INSERT INTO tickets (owner_user_id, owner_name, owner_email, owner_phone, owner_call_sign, equipment_kind, make_model, ' +
          'serial_number, units, fault_reported, accessories, firmware_versions, reflash_consent, notify_by_email, state, state_since, ' +
          'technician_id, awaiting_approval, parts_on_order, version, created_at, updated_at) VALUES (:ownerUserId, :ownerName, ' +
          ':ownerEmail, :ownerPhone, :ownerCallSign, :kind, :makeModel, :serial, :units, :fault, :accessories, :firmware, ' +
          ':reflashConsent, :notify, :state, :stateSince, :technicianId, :awaitingApproval, :partsOnOrder, :version, :openedAt, :stateSince)',
        {
          replacements: {
            ownerUserId: owner.userId,
            ownerName: owner.name,
            ownerEmail: owner.email,
            ownerPhone: owner.phone,
            ownerCallSign: owner.callSign,
            kind: t.kind,
            makeModel: t.makeModel,
            serial: t.serial,
            units: JSON.stringify(t.units),
            fault: t.fault,
            accessories: JSON.stringify(t.accessories),
            firmware: t.firmware,
            reflashConsent: t.reflashConsent,
            notify: t.notify,
            state,
            stateSince,
            technicianId,
            awaitingApproval: t.awaitingApproval ?? false,
            partsOnOrder: t.partsOnOrder ?? false,
            version: t.path.length,
            openedAt,
          },
          type: QueryTypes.INSERT,
          transaction,
        },
      );
      // Members hand in their own equipment; the bench takes in the rest.
      const openedBy = owner.userId ?? receptionist;
      await sequelize.query(
        "INSERT INTO ticket_events (ticket_id, actor_id, kind, from_state, to_state, note, created_at) VALUES (:ticketId, :actor, 'opened', NULL, 'intake', NULL, :at)",
        { replacements: { ticketId, actor: openedBy, at: openedAt }, type: QueryTypes.INSERT, transaction },
      );
      let from = 'intake';
      for (let i = 0; i < t.path.length; i++) {
        const to = t.path[i];
        await sequelize.query(
          "INSERT INTO ticket_events (ticket_id, actor_id, kind, from_state, to_state, note, created_at) VALUES (:ticketId, :actor, 'moved', :from, :to, :note, :at)",
          {
            replacements: { ticketId, actor: technicianId, from, to, note: t.notes?.[to] ?? null, at: new Date(times[i]) },
            type: QueryTypes.INSERT,
            transaction,
          },
        );
        from = to;
      }
    }
    await bumpBoardRevision(sequelize, transaction);
  });
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query('DELETE FROM tickets WHERE serial_number IN (:serials)', {
    replacements: { serials: DEMO_TICKETS.map((t) => t.serial) },
  });
}
