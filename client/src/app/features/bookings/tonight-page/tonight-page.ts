import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { provideNativeDateAdapter } from '@angular/material/core';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { of } from 'rxjs';
import { Notifier } from '../../../core/notifier';
import { BookingApi } from '../booking-api';
import { BOOKING_PURPOSE_LABELS, DaySchedule, ScheduleEntry } from '../booking.models';
import { clubDate, clubTime, clubToday, isoDate } from '../club-time';

/** "Tonight at the bench": the day's bookings for the technicians on duty, with no-shows. */
@Component({
  selector: 'rw-tonight-page',
  imports: [ReactiveFormsModule, RouterLink, MatDatepickerModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  providers: [provideNativeDateAdapter()],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './tonight-page.html',
  styleUrl: './tonight-page.scss',
})
export class TonightPage {
  private readonly api = inject(BookingApi);
  private readonly notifier = inject(Notifier);
  protected readonly purposeLabels = BOOKING_PURPOSE_LABELS;

  protected readonly settings = toSignal(this.api.settings());
  protected readonly zone = computed(() => this.settings()?.timeZone ?? 'Europe/London');
  protected readonly day = inject(NonNullableFormBuilder).control<Date | null>(clubToday('Europe/London'));
  private readonly dayValue = toSignal(this.day.valueChanges, { initialValue: this.day.value });
  protected readonly schedule = rxResource({
    params: () => {
      const d = this.dayValue();
      return d ? isoDate(d) : null;
    },
    stream: ({ params }) => (params ? this.api.schedule(params) : of(null as DaySchedule | null)),
  });
  protected readonly data = computed(() => (this.schedule.hasValue() ? this.schedule.value() : null));
  protected readonly busyId = signal<number | null>(null);
  protected readonly now = signal(Date.now());
  /** `?date=YYYY-MM-DD` opens another day's list (default: today in the club's zone). */
  readonly date = input<string>();

  constructor() {
    effect(() => {
      const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(this.date() ?? '');
      if (match) untracked(() => this.day.setValue(new Date(+match[1]!, +match[2]! - 1, +match[3]!)));
    });
  }

  protected time(iso: string): string {
    return clubTime(iso, this.zone());
  }

  protected dateWords(iso: string): string {
    return clubDate(iso, this.zone());
  }

  protected started(e: ScheduleEntry): boolean {
    return new Date(e.startsAt).getTime() <= this.now();
  }

  protected toggleNoShow(e: ScheduleEntry): void {
    this.busyId.set(e.id);
    this.api.noShow(e.id, !e.noShow).subscribe({
      next: (saved) => {
        this.busyId.set(null);
        this.notifier.info(saved.noShow ? `${saved.memberName} marked as a no-show.` : `${saved.memberName} is no longer marked as a no-show.`);
        this.schedule.reload();
      },
      error: () => this.busyId.set(null),
    });
  }

  protected refresh(): void {
    this.now.set(Date.now());
    this.schedule.reload();
  }
}
