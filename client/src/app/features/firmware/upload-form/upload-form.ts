import { ChangeDetectionStrategy, Component, computed, inject, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { catchError, of } from 'rxjs';
import { readApiError } from '../../../core/http/api-error';
import { applyServerErrors, controlMessage } from '../../../shared/form-errors';
import { FirmwareApi } from '../firmware-api';
import { sizeText } from '../firmware-format';
import { FIRMWARE_UNITS, FIRMWARE_UNIT_LABELS, FirmwareUnit, FirmwareUploaded } from '../firmware.models';

/** The most the server accepts by default (RW_FIRMWARE_MAX_BYTES); the server decides, this only warns early. */
export const FIRMWARE_MAX_BYTES = 16 * 1024 * 1024;
const MAKER_CHECKSUM = /^(?:0x)?(?:[0-9a-fA-F]{4}|[0-9a-fA-F]{8}|[0-9a-fA-F]{64})$/;

/** Upload an image to the Firmware library, with a progress bar, then show its checksums. */
@Component({
  selector: 'rw-firmware-upload-form',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatAutocompleteModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './upload-form.html',
  styleUrl: './upload-form.scss',
})
export class UploadForm {
  private readonly api = inject(FirmwareApi);
  readonly uploaded = output<FirmwareUploaded>();

  protected readonly units = FIRMWARE_UNITS;
  protected readonly unitLabels = FIRMWARE_UNIT_LABELS;
  protected readonly sizeText = sizeText;
  protected readonly message = controlMessage;
  protected readonly form = inject(NonNullableFormBuilder).group({
    model: ['', [Validators.required, Validators.maxLength(120)]],
    unit: ['' as FirmwareUnit | '', [Validators.required]],
    version: ['', [Validators.required, Validators.maxLength(40)]],
    releaseNotes: ['', [Validators.maxLength(4000)]],
    source: ['', [Validators.maxLength(300)]],
    makerChecksum: ['', [Validators.pattern(MAKER_CHECKSUM)]],
  });

  protected readonly file = signal<File | null>(null);
  protected readonly fileError = signal('');
  protected readonly progress = signal<number | null>(null);
  protected readonly formError = signal('');
  protected readonly existingId = signal<number | null>(null);
  protected readonly result = signal<(FirmwareUploaded & { model: string; version: string }) | null>(null);

  private readonly allModels = toSignal(this.api.models().pipe(catchError(() => of([] as string[]))), { initialValue: [] as string[] });
  private readonly modelText = toSignal(this.form.controls.model.valueChanges, { initialValue: '' });
  protected readonly modelOptions = computed(() => {
    const q = this.modelText().trim().toLowerCase();
    return this.allModels().filter((m) => !q || m.toLowerCase().includes(q)).slice(0, 12);
  });

  protected chooseFile(input: HTMLInputElement): void {
    const chosen = input.files?.[0] ?? null;
    this.file.set(chosen);
    this.fileError.set(this.checkFile(chosen));
  }

  private checkFile(file: File | null): string {
    if (!file) return 'Choose the image file.';
    if (file.size === 0) return 'This file is empty: choose the image file itself.';
    if (file.size > FIRMWARE_MAX_BYTES) return `This file is ${sizeText(file.size)}; the library takes at most 16 MiB.`;
    return '';
  }

  protected submit(): void {
    this.formError.set('');
    this.existingId.set(null);
    const file = this.file();
    this.fileError.set(this.checkFile(file));
    if (this.form.invalid || this.fileError() || !file) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.progress.set(0);
    this.api
      .upload({ ...v, unit: v.unit as FirmwareUnit }, file)
      .subscribe({
        next: (state) => {
          if (state.kind === 'progress') {
            this.progress.set(state.percent);
            return;
          }
          this.progress.set(null);
          this.result.set({ ...state.value, model: v.model.trim(), version: v.version.trim() });
          this.uploaded.emit(state.value);
          this.form.reset();
          this.file.set(null);
        },
        error: (err: unknown) => {
          this.progress.set(null);
          const e = readApiError(err);
          const body = (err as { error?: { error?: { existingId?: unknown } } }).error;
          const existing = body?.error?.existingId;
          if (typeof existing === 'number') this.existingId.set(existing);
          const { image, ...rest } = e.fields;
          if (image) this.fileError.set(image);
          const unplaced = applyServerErrors(this.form, rest);
          void unplaced; // the message above the form names the problem; field messages sit under their fields
          this.formError.set(e.message);
        },
      });
  }
}
