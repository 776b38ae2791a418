import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { provideNativeDateAdapter } from '@angular/material/core';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { map, of } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { TicketApi } from '../../tickets/ticket-api';
import { BookingApi } from '../booking-api';
import { BOOKING_PURPOSE_LABELS, BOOKING_PURPOSES, BookingPurpose, DaySlots, SlotStatus } from '../booking.models';
import { clubDate, clubSpan, clubTime, clubToday, isoDate } from '../club-time';
import { nextSelection, Selection, selectionSize } from '../slot-selection';

const STATUS_WORDS: Record<SlotStatus, { label: string; icon: string }> = {
  free: { label: 'Free', icon: 'event_available' },
  taken: { label: 'Taken', icon: 'block' },
  yours: { label: 'Yours', icon: 'person' },
  past: { label: 'Past', icon: 'history' },
  out_of_service: { label: 'Out of service', icon: 'build' },
};

/** Book a bench slot: a day from the calendar, each bench's slots that day, then what it is for. */
@Component({
  selector: 'rw-book-slot-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatDatepickerModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  providers: [provideNativeDateAdapter()],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './book-slot-page.html',
  styleUrl: './book-slot-page.scss',
})
export class BookSlotPage {
  private readonly api = inject(BookingApi);
  private readonly ticketApi = inject(TicketApi);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);

  protected readonly words = STATUS_WORDS;
  protected readonly purposes = BOOKING_PURPOSES;
  protected readonly purposeLabels = BOOKING_PURPOSE_LABELS;
  protected readonly message = controlMessage;
  protected readonly time = clubTime;

  protected readonly settings = toSignal(this.api.settings());
  protected readonly zone = computed(() => this.settings()?.timeZone ?? 'Europe/London');
  protected readonly minDate = computed(() => clubToday(this.zone()));
  protected readonly maxDate = computed(() => {
    const d = clubToday(this.zone());
    d.setDate(d.getDate() + (this.settings()?.horizonDays ?? 28));
    return d;
  });

  protected readonly day = this.fb.control<Date | null>(null, Validators.required);
  private readonly dayValue = toSignal(this.day.valueChanges, { initialValue: null });
  protected readonly pickedDate = computed(() => {
    const d = this.dayValue();
    return d ? isoDate(d) : null;
  });
  /** `?date=YYYY-MM-DD` opens the page on that day. */
  readonly date = input<string>();

  protected readonly slots = rxResource({
    params: () => this.pickedDate(),
    stream: ({ params }) => (params ? this.api.slots(params) : of(null as DaySlots | null)),
  });
  protected readonly dayData = computed(() => (this.slots.hasValue() ? this.slots.value() : null));

  /** Members pick one of their own open tickets; people who see every ticket type the tag. */
  protected readonly pickTicket = computed(() => !this.session.roles().some((r) => r !== 'member'));
  protected readonly myTickets = rxResource({
    params: () => this.pickTicket(),
    stream: ({ params }) =>
      params
        ? this.ticketApi.list({ page: 1, pageSize: 100, sort: 'createdAt', dir: 'desc' }).pipe(map((p) => p.items.filter((t) => t.state !== 'closed')))
        : of([]),
  });

  protected readonly selection = signal<Selection | null>(null);
  protected readonly selected = computed(() => {
    const s = this.selection();
    const day = this.dayData();
    if (!s || !day) return null;
    const bench = day.benches.find((b) => b.bench.id === s.benchId);
    if (!bench) return null;
    const slots = bench.slots.slice(s.first, s.last + 1);
    return { bench: bench.bench, slots, start: slots[0]!.start, end: slots[slots.length - 1]!.end, count: selectionSize(s) };
  });

  protected readonly form = this.fb.group({
    purpose: this.fb.control<BookingPurpose | ''>('', Validators.required),
    ticketTag: ['', [Validators.pattern(/^\s*RW-\d{4,10}\s*$/i)]],
    note: ['', [Validators.maxLength(500)]],
  });
  private readonly submitter = new FormSubmitter(this.form, {
    errorMessage: (e) => {
      if (e.code === 'slot_taken') this.refresh();
      const fields = Object.values(e.fields);
      return fields.length ? fields.join(' ') : e.message;
    },
  });
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;

  constructor() {
    effect(() => {
      const wanted = this.date();
      const match = wanted ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(wanted) : null;
      untracked(() => this.day.setValue(match ? new Date(+match[1]!, +match[2]! - 1, +match[3]!) : clubToday(this.zone())));
    });
    // Opened without a date on a day the bench is closed: go to the next opening day once.
    let jumped = false;
    effect(() => {
      const d = this.dayData();
      if (jumped || !d || this.date()) return;
      jumped = true;
      const stillOpen = d.benches.some((b) => b.slots.some((s) => s.status !== 'past'));
      if ((!d.sessions.length || !stillOpen) && d.nextSessionDate) untracked(() => this.goTo(d.nextSessionDate!));
    });
  }

  protected goTo(date: string): void {
    const [y, m, dd] = date.split('-').map(Number);
    this.day.setValue(new Date(y!, m! - 1, dd!));
    this.dayChanged();
  }

  protected dateWords(iso: string): string {
    return clubDate(iso, this.zone());
  }

  protected span(start: string, end: string): string {
    return clubSpan(start, end, this.zone());
  }

  protected isSelected(benchId: number, index: number): boolean {
    const s = this.selection();
    return !!s && s.benchId === benchId && index >= s.first && index <= s.last;
  }

  protected pick(benchId: number, index: number): void {
    const bench = this.dayData()?.benches.find((b) => b.bench.id === benchId);
    if (!bench) return;
    this.formError.set('');
    this.selection.set(nextSelection(bench.slots, this.selection(), benchId, index));
  }

  protected dayChanged(): void {
    this.selection.set(null);
    this.formError.set('');
  }

  protected book(): void {
    const chosen = this.selected();
    if (!chosen) {
      this.formError.set('Pick a free slot first: tap one, then the slots next to it for a longer booking.');
      return;
    }
    const v = this.form.getRawValue();
    this.submitter.submit(
      () =>
        this.api.book({
          benchId: chosen.bench.id,
          start: chosen.start,
          slotCount: chosen.count,
          purpose: v.purpose as BookingPurpose,
          ticketTag: v.ticketTag.trim() ? v.ticketTag.trim().toUpperCase() : null,
          note: v.note.trim() || null,
        }),
      (row) => {
        this.notifier.info(`Booked: ${row.benchName}, ${this.span(row.startsAt, row.endsAt)}. A confirmation e-mail is on its way.`);
        this.selection.set(null);
        this.form.reset({ purpose: '', ticketTag: '', note: '' });
        this.refresh();
      },
    );
  }

  protected cancel(bookingId: number): void {
    this.api.cancel(bookingId).subscribe((row) => {
      this.notifier.info(`Cancelled: ${row.benchName}, ${this.span(row.startsAt, row.endsAt)}.`);
      this.refresh();
    });
  }

  /** The day's own bookings (one entry per booking, from the slots marked yours). */
  protected readonly mine = computed(() => {
    const day = this.dayData();
    if (!day) return [];
    const out: { bookingId: number; bench: string; start: string; end: string }[] = [];
    for (const b of day.benches) {
      for (const s of b.slots) {
        if (s.status !== 'yours' || !s.bookingId) continue;
        const existing = out.find((o) => o.bookingId === s.bookingId);
        if (existing) existing.end = s.end;
        else out.push({ bookingId: s.bookingId, bench: b.bench.name, start: s.start, end: s.end });
      }
    }
    return out;
  });

  private refresh(): void {
    this.slots.reload();
  }
}
