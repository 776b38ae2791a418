// Bulk load for the board benchmark: n open tickets spread over the six lanes, inserted in
// multi-row INSERTs (about a second for 500). Invented equipment and owners, like the demo club.
import { QueryTypes, type Sequelize } from 'sequelize';
import { BOARD_LANES } from '../../api/src/domain/workflow';
import { bumpBoardRevision } from '../../api/src/modules/board/board-revision';

const MODELS = [
  ['transceiver', 'Fenwick Heron 100 HF transceiver'],
  ['transceiver', 'Carrow Avocet 5 QRP transceiver'],
  ['transceiver', 'Fenwick Reedling 2 dual-band mobile'],
  ['amplifier', 'Saltmead Bittern 600 HF linear amplifier'],
  ['tuner', 'Holloway Sedge AT-3 automatic antenna tuner'],
  ['power_supply', 'Marram PS-30 switch-mode supply (30 A)'],
  ['cable', 'Brackwater CAT/USB interface lead, 2 m'],
] as const;
const FIRST = ['Alder', 'Bryony', 'Corin', 'Delphine', 'Ewan', 'Fenella', 'Gideon', 'Hollis', 'Isolde', 'Jory'];
const LAST = ['Reed', 'Marsh', 'Dyke', 'Carr', 'Lode', 'Holme', 'Drove', 'Staithe'];

/**
 * Inserts `n` open tickets (none closed) and returns how many it inserted. Tickets are spread
 * round-robin over the lanes, ages from minutes to about two weeks, every third one assigned to a
 * technician when the demo technicians exist. Bumps the board revision.
 */
export async function seedBoardLoad(sequelize: Sequelize, n: number): Promise<number> {
  if (!Number.isInteger(n) || n < 0) throw new Error(`seedBoardLoad: n must be a whole number, got ${n}`);
  const techs = await sequelize.query<{ id: number }>(
    "SELECT u.id FROM users u JOIN user_roles r ON r.user_id = u.id AND r.role = 'technician' ORDER BY u.id",
    { type: QueryTypes.SELECT },
  );
  const now = Date.now();
  const CHUNK = 250;
  await sequelize.transaction(async (transaction) => {
    for (let start = 0; start < n; start += CHUNK) {
      const rows: string[] = [];
      const replacements: unknown[] = [];
      for (let i = start; i < Math.min(n, start + CHUNK); i++) {
        const [kind, makeModel] = MODELS[i % MODELS.length];
        const state = BOARD_LANES[i % BOARD_LANES.length];
        const name = `${FIRST[i % FIRST.length]} ${LAST[Math.floor(i / FIRST.length) % LAST.length]}`;
        const created = new Date(now - ((i * 7919) % (14 * 24 * 60)) * 60_000 - 3_600_000);
        const since = new Date(Math.min(now - 60_000, created.getTime() + ((i * 104_729) % (24 * 60)) * 60_000));
        const technicianId = state !== 'intake' && techs.length && i % 3 === 0 ? techs[i % techs.length].id : null;
        rows.push('(?, ?, NULL, ?, ?, ?, ?, ?, ?, ?, NULL, false, false, ?, ?, ?, ?, ?, 0, ?, ?)');
        replacements.push(
          name,
          `load.${i}@fenmail.example`,
          i % 4 === 0 ? null : `Q${2 + (i % 8)}L${String.fromCharCode(65 + (i % 26))}${String.fromCharCode(65 + ((i * 7) % 26))}`,
          kind,
          makeModel,
          `LOAD-${String(i).padStart(6, '0')}`,
          JSON.stringify(['main body']),
          'Load-test ticket: display dark after a power loss.',
          JSON.stringify(['DC lead']),
          state,
          since,
          technicianId,
          state === 'diagnosis' && i % 5 === 0,
          state === 'repair' && i % 4 === 0,
          created,
          since,
        );
      }
      await sequelize.query(
        'INSERT INTO tickets (owner_name, owner_email, owner_phone, owner_call_sign, equipment_kind, make_model, serial_number, units, ' +
          'fault_reported, accessories, owner_user_id, reflash_consent, notify_by_email, state, state_since, technician_id, ' +
          `awaiting_approval, parts_on_order, version, created_at, updated_at) VALUES ${rows.join(', ')}`,
        { replacements, type: QueryTypes.INSERT, transaction },
      );
    }
    await bumpBoardRevision(sequelize, transaction);
  });
  return n;
}
