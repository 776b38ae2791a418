import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { PhotoStage, TicketPhoto } from '@contracts/photos';
import { readApiError } from '../../../core/http/api-error';
import { PhotoApi } from './photo-api';

/** What the picker offers; the server decides from the bytes anyway. */
const ACCEPT = 'image/jpeg,image/png,image/webp';

/**
 * Photos of one ticket at one stage: an upload button with a progress bar, and a gallery of
 * thumbnails that open the full photo. Inputs are just the ticket's tag and the stage, so the
 * intake stepper, the ticket page and the repair log can each place one.
 */
@Component({
  selector: 'rw-ticket-photos',
  imports: [DecimalPipe, MatButtonModule, MatIconModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-photos.html',
  styleUrl: './ticket-photos.scss',
})
export class TicketPhotos {
  readonly tag = input.required<string>();
  readonly stage = input<PhotoStage>('intake');
  /** False hides the upload button (e.g. for a member once the ticket has left intake). */
  readonly canUpload = input(true);

  private readonly api = inject(PhotoApi);
  protected readonly accept = ACCEPT;
  protected readonly photos = rxResource({
    params: () => ({ tag: this.tag(), stage: this.stage() }),
    stream: ({ params }) => this.api.list(params.tag, params.stage),
  });
  protected readonly items = computed<TicketPhoto[]>(() => (this.photos.hasValue() ? this.photos.value().items : []));
  /** The file being sent and how far it got (null when idle). */
  protected readonly sending = signal<{ name: string; percent: number } | null>(null);
  protected readonly error = signal('');
  protected readonly stageWord = computed(() => (this.stage() === 'intake' ? 'condition' : 'repair'));

  protected pick(input: HTMLInputElement): void {
    const files = Array.from(input.files ?? []);
    input.value = '';
    void this.sendAll(files);
  }

  /** One at a time, so each has its own progress and its own error. */
  private async sendAll(files: File[]): Promise<void> {
    this.error.set('');
    for (const file of files) {
      const ok = await this.send(file);
      if (!ok) break;
    }
  }

  private send(file: File): Promise<boolean> {
    this.sending.set({ name: file.name, percent: 0 });
    return new Promise((resolve) => {
      this.api.upload(this.tag(), this.stage(), file).subscribe({
        next: (event) => {
          if (event.kind === 'progress') this.sending.set({ name: file.name, percent: event.percent });
          else this.photos.value.update((v) => ({ items: [...(v?.items ?? []), event.photo] }));
        },
        error: (err: unknown) => {
          this.sending.set(null);
          this.error.set(`${file.name}: ${readApiError(err).message}`);
          resolve(false);
        },
        complete: () => {
          this.sending.set(null);
          resolve(true);
        },
      });
    });
  }
}
