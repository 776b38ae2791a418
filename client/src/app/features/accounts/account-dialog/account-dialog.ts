import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Observable } from 'rxjs';
import { ROLES, ROLE_LABELS, Role } from '../../../core/auth/auth.models';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { PASSWORD_HINT, passwordValidators } from '../../auth/password-rules';
import { AccountApi } from '../account-api';
import { UserRow } from '../account.models';

/** Opened with an account to edit it, or with nothing to create one. */
export type AccountDialogData = { account: UserRow | null };

function atLeastOneRole(control: AbstractControl<Record<Role, boolean>>): ValidationErrors | null {
  return Object.values(control.value).some(Boolean) ? null : { noRole: true };
}

/** Create an account, or edit one's name, call sign and roles. Closes with the saved row. */
@Component({
  selector: 'rw-account-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './account-dialog.html',
  styles: `
    .full-width { width: 100%; }
    form { min-width: min(440px, 80vw); }
    fieldset { border: 0; padding: 0; margin: 0 0 8px; }
    legend { font: var(--mat-sys-title-small); margin-bottom: 4px; }
    .roles { display: flex; flex-wrap: wrap; gap: 0 12px; }
    .field-error { color: var(--mat-sys-error); font: var(--mat-sys-body-small); margin: 0; }
  `,
})
export class AccountDialog {
  private readonly api = inject(AccountApi);
  private readonly ref = inject<MatDialogRef<AccountDialog, UserRow>>(MatDialogRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly account = inject<AccountDialogData>(MAT_DIALOG_DATA).account;

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected readonly form = this.fb.group({
    email: [this.account?.email ?? '', [Validators.required, Validators.email, Validators.maxLength(254)]],
    displayName: [this.account?.displayName ?? '', [Validators.required, Validators.maxLength(100)]],
    callSign: [this.account?.callSign ?? '', [Validators.maxLength(12)]],
    roles: this.fb.group(
      {
        member: [this.account ? this.account.roles.includes('member') : true],
        technician: [this.account?.roles.includes('technician') ?? false],
        treasurer: [this.account?.roles.includes('treasurer') ?? false],
        admin: [this.account?.roles.includes('admin') ?? false],
      },
      { validators: atLeastOneRole },
    ),
    password: ['', passwordValidators],
  });

  private readonly submitter = new FormSubmitter(this.form, {
    errorMessage: (apiError) => {
      if (apiError.code === 'email_taken') {
        this.form.controls.email.setErrors({ server: apiError.message });
        this.form.controls.email.markAsTouched();
        return '';
      }
      return placeServerError(this.form, apiError);
    },
  });
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;

  constructor() {
    if (this.account) {
      // E-mail and password are not changed here; the person changes their own password.
      this.form.controls.email.disable();
      this.form.controls.password.disable();
    }
  }

  protected save(): void {
    this.submitter.submit(
      () => this.request(),
      (row) => this.ref.close(row),
    );
  }

  /** Update the account being edited, or create a new one, from the form's values. */
  private request(): Observable<UserRow> {
    const v = this.form.getRawValue();
    const roles = ROLES.filter((r) => v.roles[r]);
    const callSign = v.callSign.trim().toUpperCase();
    return this.account
      ? this.api.update(this.account.id, { displayName: v.displayName.trim(), callSign: callSign || null, roles }, true)
      : this.api.create({
          email: v.email.trim(),
          displayName: v.displayName.trim(),
          roles,
          password: v.password,
          ...(callSign ? { callSign } : {}),
        });
  }
}
