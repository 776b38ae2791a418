import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { AuthApi } from '../../../core/auth/auth-api';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { PASSWORD_HINT, passwordValidators } from '../password-rules';

@Component({
  selector: 'rw-change-password-page',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './change-password-page.html',
})
export class ChangePasswordPage {
  private readonly api = inject(AuthApi);
  private readonly notifier = inject(Notifier);
  protected readonly form = inject(NonNullableFormBuilder).group({
    currentPassword: ['', [Validators.required]],
    newPassword: ['', passwordValidators],
  });
  protected readonly busy = signal(false);
  protected readonly formError = signal('');
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected submit(): void {
    this.formError.set('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api.changePassword(this.form.getRawValue()).subscribe({
      next: () => {
        this.busy.set(false);
        this.form.reset();
        this.notifier.info('Password changed. You stay signed in here; other devices are signed out.');
      },
      error: (err: unknown) => {
        const apiError = readApiError(err);
        this.formError.set(placeServerError(this.form, apiError));
        this.busy.set(false);
      },
    });
  }
}
