import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { Notifier } from '../../../core/notifier';
import { FormSubmitter } from '../../../shared/form-submit';
import { controlMessage } from '../../../shared/form-errors';
import { FirmwareApi } from '../firmware-api';
import { rateText, sizeText } from '../firmware-format';
import { FIRMWARE_UNIT_LABELS, FirmwareImage } from '../firmware.models';
import { StatusLabel } from '../status-label';

/** One image of the library: its checksums, where it came from, its record, and the marks. */
@Component({
  selector: 'rw-image-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    StatusLabel,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './image-page.html',
  styleUrl: './image-page.scss',
})
export class ImagePage {
  /** The entry number from the route (`/firmware/:id`). */
  readonly id = input.required<string>();
  private readonly api = inject(FirmwareApi);
  private readonly notifier = inject(Notifier);

  protected readonly unitLabels = FIRMWARE_UNIT_LABELS;
  protected readonly sizeText = sizeText;
  protected readonly rateText = rateText;
  protected readonly message = controlMessage;
  protected readonly image = rxResource({ params: () => Number(this.id()), stream: ({ params }) => this.api.get(params) });
  protected readonly record = rxResource({
    params: () => (this.image.hasValue() ? { model: this.image.value().model, unit: this.image.value().unit } : undefined),
    stream: ({ params }) => this.api.trackRecord(params.model, params.unit),
  });
  protected readonly thisRecord = computed(() => {
    const image = this.image.hasValue() ? this.image.value() : undefined;
    if (!this.record.hasValue() || !image) return null;
    return this.record.value().images.find((r) => r.firmwareId === image.id) ?? null;
  });
  protected readonly marking = signal(false);
  protected readonly withdrawForm = inject(NonNullableFormBuilder).group({
    reason: ['', [Validators.required, Validators.minLength(3), Validators.maxLength(500)]],
  });
  protected readonly withdrawal = new FormSubmitter(this.withdrawForm);

  protected downloadUrl(id: number): string {
    return this.api.downloadUrl(id);
  }

  protected mark(image: FirmwareImage, knownGood: boolean): void {
    this.marking.set(true);
    this.api.markKnownGood(image.id, knownGood).subscribe({
      next: (saved) => {
        this.marking.set(false);
        this.image.value.set(saved);
        this.notifier.info(knownGood ? `${saved.model} ${saved.version} is marked known good.` : `${saved.model} ${saved.version} is no longer marked known good.`);
      },
      error: () => this.marking.set(false),
    });
  }

  protected withdraw(image: FirmwareImage): void {
    this.withdrawal.submit(
      () => this.api.withdraw(image.id, this.withdrawForm.getRawValue().reason.trim()),
      (saved) => {
        this.image.value.set(saved);
        this.withdrawForm.reset();
        this.notifier.info(`${saved.model} ${saved.version} is withdrawn; it can no longer be chosen for a flash attempt.`);
      },
    );
  }
}
