import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { controlMessage } from '../form-errors';

export interface NoteDialogData {
  title: string;
  prompt: string;
  confirmLabel: string;
  /** Shortest note accepted (the workflow asks for at least 3 characters where a note is needed). */
  minLength: number;
  /** A note written before and not yet sent (e.g. the move met a 409): shown again for the retry. */
  initialNote?: string;
  /** Says why the note is shown again (e.g. "Your note is kept: ..."). */
  notice?: string;
}

/** Asks for the note some moves need ("why it goes back unrepaired"). Closes with the note or nothing. */
@Component({
  selector: 'rw-note-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <form [formGroup]="form" (ngSubmit)="save()">
      <mat-dialog-content>
        @if (data.notice) {
          <p class="notice" role="status">{{ data.notice }}</p>
        }
        <p>{{ data.prompt }}</p>
        <mat-form-field class="full-width">
          <mat-label>Note for the timeline</mat-label>
          <textarea matInput formControlName="note" rows="3" cdkFocusInitial></textarea>
          <mat-error>{{ message() }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit">{{ data.confirmLabel }}</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `.full-width { width: 100%; min-width: min(420px, 80vw); } .notice { font-weight: 600; }`,
})
export class NoteDialog {
  protected readonly data = inject<NoteDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<NoteDialog, string>>(MatDialogRef);
  protected readonly form = inject(NonNullableFormBuilder).group({
    note: [this.data.initialNote ?? '', [Validators.required, Validators.minLength(this.data.minLength), Validators.maxLength(2000)]],
  });

  protected message(): string {
    return controlMessage(this.form.controls.note, 'the note');
  }

  protected save(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.ref.close(this.form.controls.note.value.trim());
  }
}
