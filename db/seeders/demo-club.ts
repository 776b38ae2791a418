// The demo club: Kestrel Fen Radio Society. Every name, call sign, address, serial number and
// piece of equipment here is invented. Call signs use the prefix Q, which the ITU has not
// allocated to any country. Makes and models are our own inventions (fenland bird names), not
// real manufacturers' products.
import type { Role } from '../../api/src/contracts/accounts';
import type { TicketState } from '../../api/src/domain/workflow';
import type { EquipmentKind } from '../../api/src/contracts/tickets';

/** The demo club's name: seeded into the club settings (003-demo-club-settings.ts), never used by the code. */
export const DEMO_CLUB_NAME = 'Kestrel Fen Radio Society';

export interface DemoAccount {
  email: string;
  displayName: string;
  callSign: string | null;
  roles: Role[];
  /** Documented demo password, or null for a random one nobody knows (the account can reset it). */
  password: string | null;
}

/** Demo sign-ins (documented in db/seed.ts and the README): one account per role, and a second technician. */
export const DEMO_ACCOUNTS: DemoAccount[] = [
  { email: 'admin@kestrelfen.example', displayName: 'Hester Vane', callSign: 'Q2KFA', roles: ['admin', 'member'], password: 'bench-demo-admin' },
  { email: 'tech@kestrelfen.example', displayName: 'Tobin Marsh', callSign: 'Q2KFT', roles: ['technician', 'member'], password: 'bench-demo-tech' },
  { email: 'tech2@kestrelfen.example', displayName: 'Ysolde Crane', callSign: 'Q7YSC', roles: ['technician', 'member'], password: 'bench-demo-tech2' },
  { email: 'treasurer@kestrelfen.example', displayName: 'Gwilym Orchard', callSign: 'Q2KFB', roles: ['treasurer', 'member'], password: 'bench-demo-treasurer' },
  { email: 'member@kestrelfen.example', displayName: 'Perrin Sallow', callSign: 'Q3PSW', roles: ['member'], password: 'bench-demo-member' },
  { email: 'morwenna.tulk@kestrelfen.example', displayName: 'Morwenna Tulk', callSign: 'Q3MTK', roles: ['member'], password: null },
  { email: 'idris.pennock@kestrelfen.example', displayName: 'Idris Pennock', callSign: 'Q5IDP', roles: ['member'], password: null },
  { email: 'aurelie.dunmore@kestrelfen.example', displayName: 'Aurélie Dunmore', callSign: 'Q3AUD', roles: ['member'], password: null },
  { email: 'cassian.fell@kestrelfen.example', displayName: 'Cassian Fell', callSign: 'Q6CFL', roles: ['member'], password: null },
  { email: 'nell.rookwood@kestrelfen.example', displayName: 'Nell Rookwood', callSign: 'Q3NRW', roles: ['member'], password: null },
  { email: 'oswin.haddow@kestrelfen.example', displayName: 'Oswin Haddow', callSign: 'Q5OHD', roles: ['member'], password: null },
  { email: 'tamsin.greave@kestrelfen.example', displayName: 'Tamsin Greave', callSign: 'Q2TGV', roles: ['member'], password: null },
  { email: 'bartholomew.sedge@kestrelfen.example', displayName: 'Bartholomew Sedge', callSign: 'Q4BSG', roles: ['member'], password: null },
  { email: 'ifeoma.carrick@kestrelfen.example', displayName: 'Ifeoma Carrick', callSign: 'Q3IFC', roles: ['member'], password: null },
  { email: 'leontyne.wherry@kestrelfen.example', displayName: 'Leontyne Wherry', callSign: 'Q7LWY', roles: ['member'], password: null },
  { email: 'rufus.lodden@kestrelfen.example', displayName: 'Rufus Lodden', callSign: 'Q5RLD', roles: ['member'], password: null },
];


export interface DemoTicket {
  /** Owner's e-mail (one of DEMO_ACCOUNTS), or an owner without an account. */
  owner: string | { name: string; email: string; phone: string; callSign: string | null };
  kind: EquipmentKind;
  makeModel: string;
  serial: string;
  units: string[];
  fault: string;
  accessories: string[];
  firmware: string | null;
  reflashConsent: boolean;
  notify: boolean;
  /** The lanes it went through after intake, in order; the last is where it is now. */
  path: TicketState[];
  /** Hours since it was handed in, and since its last move. */
  ageHours: number;
  inStateHours: number;
  technician: 'tech@kestrelfen.example' | 'tech2@kestrelfen.example' | null;
  awaitingApproval?: boolean;
  partsOnOrder?: boolean;
  /** Notes on the moves, by target lane. */
  notes?: Partial<Record<TicketState, string>>;
}

const T1 = 'tech@kestrelfen.example' as const;
const T2 = 'tech2@kestrelfen.example' as const;

export const DEMO_TICKETS: DemoTicket[] = [
  // ---- intake ----
  {
    owner: 'member@kestrelfen.example', kind: 'transceiver', makeModel: 'Fenwick Heron 100 HF transceiver', serial: 'FH100-23817',
    units: ['display head', 'main body'], fault: 'Display stays dark after a power cut at the shack; the relay clicks at switch-on but nothing else.',
    accessories: ['control cable', 'DC lead', 'microphone'], firmware: 'Head 1.07, main 2.11 (from the owner’s notes)',
    reflashConsent: true, notify: true, path: [], ageHours: 1, inStateHours: 1, technician: null,
  },
  {
    owner: 'morwenna.tulk@kestrelfen.example', kind: 'power_supply', makeModel: 'Marram PS-30 switch-mode supply (30 A)', serial: 'MPS30-0442',
    units: ['supply'], fault: 'Hum on the supply output heard in the receiver audio, worse under transmit load.',
    accessories: ['mains lead'], firmware: null, reflashConsent: false, notify: true, path: [], ageHours: 5, inStateHours: 5, technician: null,
  },
  {
    owner: { name: 'Edmund Rushby', email: 'e.rushby@fenmail.example', phone: '01632 960417', callSign: null }, kind: 'tuner',
    makeModel: 'Holloway Sedge AT-3 automatic antenna tuner', serial: 'HS3-11890', units: ['tuner'],
    fault: 'Tuner cycles endlessly on 40 m and never settles; other bands tune normally.', accessories: ['control cable', 'DC lead'],
    firmware: null, reflashConsent: false, notify: true, path: [], ageHours: 30, inStateHours: 30, technician: null,
  },
  {
    owner: 'cassian.fell@kestrelfen.example', kind: 'cable', makeModel: 'Brackwater CAT/USB interface lead, 2 m', serial: 'BW-CL-7731',
    units: ['lead'], fault: 'Intermittent CAT control: the logging program loses the radio every few minutes.',
    accessories: [], firmware: null, reflashConsent: false, notify: false, path: [], ageHours: 80, inStateHours: 80, technician: null,
  },
  // ---- diagnosis ----
  {
    owner: 'idris.pennock@kestrelfen.example', kind: 'transceiver', makeModel: 'Carrow Avocet 5 QRP transceiver', serial: 'CAV5-00931',
    units: ['transceiver'], fault: 'No transmit output on any band; receive is fine and the TX indicator lights.',
    accessories: ['DC lead', 'microphone'], firmware: '3.2', reflashConsent: true, notify: true,
    path: ['diagnosis'], ageHours: 26, inStateHours: 20, technician: T1,
  },
  {
    owner: 'aurelie.dunmore@kestrelfen.example', kind: 'transceiver', makeModel: 'Fenwick Reedling 2 dual-band mobile', serial: 'FR2-55120',
    units: ['control head', 'main body'], fault: 'Control head shows “NO LINK” after the separation cable was replaced.',
    accessories: ['separation cable', 'DC lead', 'microphone'], firmware: 'Head 4.0, body 4.0', reflashConsent: true, notify: true,
    path: ['diagnosis'], ageHours: 50, inStateHours: 46, technician: T2,
  },
  {
    owner: 'nell.rookwood@kestrelfen.example', kind: 'amplifier', makeModel: 'Saltmead Bittern 600 HF linear amplifier', serial: 'SB600-2208',
    units: ['amplifier'], fault: 'Trips to standby with a high-SWR warning into a dummy load that reads 1.1:1 on the bench meter.',
    accessories: ['control cable', 'mains lead'], firmware: '1.4', reflashConsent: false, notify: true,
    path: ['diagnosis'], ageHours: 120, inStateHours: 100, technician: T1, awaitingApproval: true,
  },
  {
    owner: 'oswin.haddow@kestrelfen.example', kind: 'transceiver', makeModel: 'Brackwater Snipe 2 handheld', serial: 'BSN2-76004',
    units: ['handheld', 'battery pack'], fault: 'Will not charge in the drop-in charger; battery pack is warm after an hour.',
    accessories: ['drop-in charger'], firmware: null, reflashConsent: false, notify: true,
    path: ['diagnosis'], ageHours: 6, inStateHours: 3, technician: T2,
  },
  // ---- reflash ----
  {
    owner: 'tamsin.greave@kestrelfen.example', kind: 'transceiver', makeModel: 'Fenwick Heron 100 HF transceiver', serial: 'FH100-19260',
    units: ['display head', 'main body'], fault: 'Display dark after the computer was left connected while the radio was switched off.',
    accessories: ['control cable', 'DC lead'], firmware: 'Head unknown, main 2.09', reflashConsent: true, notify: true,
    path: ['diagnosis', 'reflash'], ageHours: 72, inStateHours: 26, technician: T1,
    notes: { reflash: 'Soft reset with the control cable out did not help; display head does not answer on its serial port.' },
  },
  {
    owner: 'bartholomew.sedge@kestrelfen.example', kind: 'transceiver', makeModel: 'Marsh Warbler 50 VHF all-mode', serial: 'MW50-3317',
    units: ['transceiver'], fault: 'Stuck on the start-up logo after a firmware update was interrupted.',
    accessories: ['DC lead', 'USB lead'], firmware: '2.3 → 2.4 (interrupted)', reflashConsent: true, notify: true,
    path: ['diagnosis', 'reflash'], ageHours: 96, inStateHours: 90, technician: T2,
  },
  {
    owner: 'member@kestrelfen.example', kind: 'transceiver', makeModel: 'Carrow Teal 7 HF/6 m transceiver', serial: 'CT7-40118',
    units: ['main body'], fault: 'Front panel lights, then resets every few seconds.', accessories: ['DC lead', 'microphone'],
    firmware: '1.12', reflashConsent: true, notify: false, path: ['diagnosis', 'reflash'], ageHours: 200, inStateHours: 150, technician: T1,
  },
  // ---- repair ----
  {
    owner: 'ifeoma.carrick@kestrelfen.example', kind: 'transceiver', makeModel: 'Carrow Avocet 5 QRP transceiver', serial: 'CAV5-01766',
    units: ['transceiver'], fault: 'Receive goes deaf on 20 m after about ten minutes of operating.', accessories: ['DC lead'],
    firmware: '3.1', reflashConsent: false, notify: true, path: ['diagnosis', 'repair'], ageHours: 160, inStateHours: 60, technician: T2,
    partsOnOrder: true, notes: { repair: 'Dry joint suspected at the 20 m band-pass filter relay; replacement relay ordered.' },
  },
  {
    owner: 'leontyne.wherry@kestrelfen.example', kind: 'power_supply', makeModel: 'Marram LP-20 linear supply (20 A)', serial: 'MLP20-0077',
    units: ['supply'], fault: 'Output drops to 11 V under transmit load; fan runs constantly.', accessories: ['mains lead'],
    firmware: null, reflashConsent: false, notify: true, path: ['diagnosis', 'repair'], ageHours: 240, inStateHours: 30, technician: T1,
  },
  {
    owner: 'morwenna.tulk@kestrelfen.example', kind: 'transceiver', makeModel: 'Marsh Warbler 50 VHF all-mode', serial: 'MW50-2954',
    units: ['transceiver'], fault: 'Display came back after a reflash, but transmit output is still zero.', accessories: ['DC lead', 'microphone'],
    firmware: '2.4', reflashConsent: true, notify: true, path: ['diagnosis', 'reflash', 'repair'], ageHours: 300, inStateHours: 44, technician: T2,
    notes: { repair: 'Reflash verified running, but no RF output: PA stage to be checked.' },
  },
  // ---- bench test ----
  {
    owner: 'rufus.lodden@kestrelfen.example', kind: 'amplifier', makeModel: 'Saltmead Plover 300 HF amplifier', serial: 'SP300-5120',
    units: ['amplifier'], fault: 'Output relay chatters on transmit.', accessories: ['control cable', 'mains lead'],
    firmware: null, reflashConsent: false, notify: true, path: ['diagnosis', 'repair', 'bench_test'], ageHours: 220, inStateHours: 8, technician: T1,
  },
  {
    owner: 'aurelie.dunmore@kestrelfen.example', kind: 'transceiver', makeModel: 'Fenwick Heron 100 HF transceiver', serial: 'FH100-27701',
    units: ['display head', 'main body'], fault: 'Frequency drifts upward by a few hundred hertz as the radio warms up.', accessories: ['DC lead'],
    firmware: 'Head 1.07, main 2.11', reflashConsent: false, notify: true, path: ['diagnosis', 'repair', 'bench_test'], ageHours: 330, inStateHours: 75, technician: T2,
  },
  // ---- return ----
  {
    owner: 'idris.pennock@kestrelfen.example', kind: 'accessory', makeModel: 'Holloway Sedge desk microphone', serial: 'HSM-0310',
    units: ['microphone'], fault: 'Transmit audio reported as thin and distorted by other stations.', accessories: ['microphone cable'],
    firmware: null, reflashConsent: false, notify: true, path: ['diagnosis', 'return'], ageHours: 140, inStateHours: 20, technician: T1,
    notes: { return: 'No fault found: audio tested clean into a second radio; owner’s mic gain was set to maximum.' },
  },
  {
    owner: { name: 'Philippa Brome', email: 'p.brome@fenmail.example', phone: '01632 960882', callSign: 'Q4PBR' }, kind: 'transceiver',
    makeModel: 'Brackwater Snipe 2 handheld', serial: 'BSN2-70415', units: ['handheld'], fault: 'Dropped in water; will not power on.',
    accessories: ['battery pack'], firmware: null, reflashConsent: false, notify: true, path: ['diagnosis', 'return'], ageHours: 90, inStateHours: 50, technician: T2,
    notes: { return: 'Unrepairable: corrosion across the main board; owner informed and agrees.' },
  },
  // ---- closed ----
  {
    owner: 'tamsin.greave@kestrelfen.example', kind: 'cable', makeModel: 'Brackwater DC lead with fuses, 3 m', serial: 'BW-DC-1202',
    units: ['lead'], fault: 'Radio resets on transmit; suspected voltage drop in the DC lead.', accessories: [],
    firmware: null, reflashConsent: false, notify: true, path: ['diagnosis', 'repair', 'bench_test', 'return', 'closed'],
    ageHours: 336, inStateHours: 100, technician: T1,
    notes: { repair: 'Crimped lugs replaced; fuse holders cleaned.', closed: 'Collected by the owner.' },
  },
  {
    owner: 'cassian.fell@kestrelfen.example', kind: 'transceiver', makeModel: 'Carrow Teal 7 HF/6 m transceiver', serial: 'CT7-38894',
    units: ['main body'], fault: 'Dark display after a power loss during a contest.', accessories: ['DC lead', 'control cable'],
    firmware: '1.10', reflashConsent: true, notify: true, path: ['diagnosis', 'reflash', 'bench_test', 'return', 'closed'],
    ageHours: 320, inStateHours: 150, technician: T2,
    notes: { reflash: 'Soft reset did not help; main unit reflashed to 1.12.', closed: 'Collected by the owner.' },
  },
];
