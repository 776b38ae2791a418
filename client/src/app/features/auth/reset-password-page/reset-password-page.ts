import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { readApiError } from '../../../core/http/api-error';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { PASSWORD_HINT, passwordValidators } from '../password-rules';

@Component({
  selector: 'rw-reset-password-page',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './reset-password-page.html',
})
export class ResetPasswordPage {
  /** The single-use token from the e-mailed link (`?token=`). */
  readonly token = input<string>();

  private readonly api = inject(AuthApi);
  protected readonly form = inject(NonNullableFormBuilder).group({
    newPassword: ['', passwordValidators],
  });
  protected readonly busy = signal(false);
  protected readonly done = signal(false);
  protected readonly formError = signal('');
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected submit(): void {
    this.formError.set('');
    const token = this.token();
    if (!token) {
      this.formError.set('This link has no token. Open the link from the e-mail again, or ask for a new one.');
      return;
    }
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api.confirmPasswordReset({ token, newPassword: this.form.controls.newPassword.value }).subscribe({
      next: () => {
        this.done.set(true);
        this.busy.set(false);
      },
      error: (err: unknown) => {
        const apiError = readApiError(err);
        const text = placeServerError(this.form, apiError);
        this.formError.set(
          apiError.code === 'reset_token_invalid' ? 'This link has expired or was already used.' : text,
        );
        this.busy.set(false);
      },
    });
  }
}
