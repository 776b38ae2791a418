import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { SessionStore } from '../../../core/auth/session-store';
import { TicketDetail } from '../../tickets/ticket.models';
import { HandBackSection } from '../hand-back/hand-back';
import { RepairLog } from '../repair-log/repair-log';
import { TestSheetSection } from '../test-sheet/test-sheet';

/**
 * The ticket page's bench records from Repair on: the repair log (the bench's own, never the
 * owner's), test sheets with their reports, and the hand-back. Each shows from the lane where it
 * starts; records stay visible after the ticket moves on.
 */
@Component({
  selector: 'rw-bench-records',
  imports: [RepairLog, TestSheetSection, HandBackSection],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (showRepairLog()) {
      <rw-repair-log [ticket]="ticket()" (recorded)="changed.emit()" />
    }
    @if (showTestSheets()) {
      <rw-test-sheet [ticket]="ticket()" (recorded)="changed.emit()" />
    }
    @if (showHandBack()) {
      <rw-hand-back [ticket]="ticket()" (recorded)="changed.emit()" />
    }
  `,
})
export class BenchRecords {
  readonly ticket = input.required<TicketDetail>();
  /** A record was saved: the ticket's moves (and perhaps its lane) may have changed. */
  readonly changed = output<void>();

  private readonly session = inject(SessionStore);
  private readonly state = computed(() => this.ticket().state);
  protected readonly showRepairLog = computed(
    () => this.session.hasAnyRole('technician', 'treasurer', 'admin') && ['repair', 'bench_test', 'return', 'closed'].includes(this.state()),
  );
  protected readonly showTestSheets = computed(() => ['repair', 'bench_test', 'return', 'closed'].includes(this.state()));
  protected readonly showHandBack = computed(() => ['return', 'closed'].includes(this.state()));
}
