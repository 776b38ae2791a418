import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatRadioModule } from '@angular/material/radio';
import { NOTE_AUDIENCE_LABELS, type NoteAudience } from '@contracts/owner-records';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { TicketDetail } from '../../tickets/ticket.models';
import { OwnerRecordsApi } from '../owner-records-api';
import { recordFieldMessage } from '../record-forms';

/** Notes on a ticket, each showing who will read it; the bench writes them for itself or for the owner. */
@Component({
  selector: 'rw-notes-section',
  imports: [ReactiveFormsModule, DatePipe, MatCardModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatPaginatorModule, MatRadioModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './notes-section.html',
  styleUrl: '../owner-records.scss',
})
export class NotesSection {
  readonly ticket = input.required<TicketDetail>();
  readonly changed = output<void>();

  private readonly api = inject(OwnerRecordsApi);
  private readonly notifier = inject(Notifier);
  protected readonly session = inject(SessionStore);
  protected readonly audienceLabels = NOTE_AUDIENCE_LABELS;
  protected readonly message = recordFieldMessage;
  protected readonly page = signal({ page: 1, pageSize: 10 });

  protected readonly notes = rxResource({
    params: () => ({ tag: this.ticket().tag, ...this.page() }),
    stream: ({ params }) => this.api.notes(params.tag, params.page, params.pageSize),
  });

  protected readonly form = inject(NonNullableFormBuilder).group({
    text: ['', [Validators.required, Validators.minLength(2), Validators.maxLength(2000)]],
    audience: ['internal' as NoteAudience],
  });
  protected readonly sending = signal(false);
  protected readonly error = signal('');

  protected paged(e: PageEvent): void {
    this.page.set({ page: e.pageIndex + 1, pageSize: e.pageSize });
  }

  protected add(): void {
    if (this.sending()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.sending.set(true);
    this.error.set('');
    this.api.addNote(this.ticket().tag, { text: v.text.trim(), audience: v.audience }).subscribe({
      next: (note) => {
        this.sending.set(false);
        this.form.reset({ text: '', audience: 'internal' });
        this.notifier.info(note.audience === 'owner' ? 'Note saved; the owner can read it and gets it by e-mail.' : 'Note saved for the bench only.');
        this.page.set({ ...this.page(), page: 1 });
        this.notes.reload();
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.sending.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
