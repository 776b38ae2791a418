import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
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
  private readonly submitter = new FormSubmitter(this.form, {
    errorMessage: (apiError) => {
      const text = placeServerError(this.form, apiError);
      return apiError.code === 'reset_token_invalid' ? 'This link has expired or was already used.' : text;
    },
  });
  protected readonly busy = this.submitter.busy;
  protected readonly done = signal(false);
  protected readonly formError = this.submitter.formError;
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected submit(): void {
    const token = this.token();
    if (!token) {
      this.formError.set('This link has no token. Open the link from the e-mail again, or ask for a new one.');
      return;
    }
    this.submitter.submit(
      () => this.api.confirmPasswordReset({ token, newPassword: this.form.controls.newPassword.value }),
      () => this.done.set(true),
    );
  }
}
