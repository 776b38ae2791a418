import { TestLimitsView } from '@contracts/bench-records';
import { DEFAULT_TEST_LIMITS } from '@domain/test-sheet';
import { TicketDetail } from '../tickets/ticket.models';

/** A ticket for the specs (invented: the demo club's own style). */
export function ticketFixture(over: Partial<TicketDetail> = {}): TicketDetail {
  return {
    id: 42,
    tag: 'RW-0042',
    equipmentKind: 'transceiver',
    makeModel: 'Fenwick Heron 100',
    ownerName: 'Perrin Sallow',
    state: 'bench_test',
    stateSince: '2026-11-30T18:00:00.000Z',
    createdAt: '2026-11-20T18:00:00.000Z',
    version: 3,
    serialNumber: 'FH100-00417',
    units: ['main body'],
    faultReported: 'No transmit output.',
    symptoms: ['no_transmit'],
    accessoriesNote: null,
    updatesBy: 'email',
    technicianId: 3,
    previousState: 'repair',
    undo: null,
    accessories: ['control cable', 'DC lead'],
    firmwareVersions: null,
    reflashConsent: false,
    notifyByEmail: true,
    ownerEmail: 'perrin@kestrelfen.example',
    ownerPhone: null,
    ownerCallSign: 'Q3PSW',
    technicianName: 'Tobin Marsh',
    awaitingApproval: false,
    partsOnOrder: false,
    events: [],
    moves: [],
    ...over,
  };
}

export const LIMITS_FIXTURE: TestLimitsView = { limits: DEFAULT_TEST_LIMITS, custom: [], updatedAt: null };
