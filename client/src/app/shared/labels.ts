import { STATE_LABELS, TicketState } from '@domain/workflow';
import { FLAGS, Flag } from '@contracts/board';
import { EQUIPMENT_KIND_LABELS, EQUIPMENT_KINDS, EquipmentKind } from '@contracts/tickets';

// The code lists are the API's (api/src/contracts/); the words and icons for them live here.
export { EQUIPMENT_KIND_LABELS, EQUIPMENT_KINDS, FLAGS };
export type { EquipmentKind, Flag };

// Words and icons for states and flags: status is never colour alone (design-language.md).

export const STATE_ICONS: Record<TicketState, string> = {
  intake: 'move_to_inbox',
  diagnosis: 'troubleshoot',
  reflash: 'memory',
  repair: 'build',
  bench_test: 'speed',
  return: 'assignment_return',
  closed: 'task_alt',
};

export function stateLabel(state: TicketState): string {
  return STATE_LABELS[state] ?? state;
}

export const FLAG_LABELS: Record<Flag, string> = {
  awaiting_approval: 'Owner to approve',
  parts_on_order: 'Parts on order',
  balance_due: 'Balance due',
  test_failed: 'Test failed',
};

export const FLAG_ICONS: Record<Flag, string> = {
  awaiting_approval: 'approval',
  parts_on_order: 'local_shipping',
  balance_due: 'payments',
  test_failed: 'report',
};

export function equipmentKindLabel(kind: string): string {
  return EQUIPMENT_KIND_LABELS[kind as EquipmentKind] ?? kind;
}
