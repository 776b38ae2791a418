import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { PASSWORD_HINT, passwordValidators } from '../password-rules';

@Component({
  selector: 'rw-register-page',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './register-page.html',
})
export class RegisterPage {
  private readonly api = inject(AuthApi);
  private readonly session = inject(SessionStore);
  private readonly router = inject(Router);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
    displayName: ['', [Validators.required, Validators.maxLength(100)]],
    callSign: ['', [Validators.maxLength(12)]],
    password: ['', passwordValidators],
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
    const { email, displayName, callSign, password } = this.form.getRawValue();
    this.busy.set(true);
    this.api
      .register({ email: email.trim(), displayName: displayName.trim(), password, ...(callSign.trim() ? { callSign: callSign.trim().toUpperCase() } : {}) })
      .subscribe({
        next: ({ user }) => {
          this.session.set(user);
          this.busy.set(false);
          void this.router.navigateByUrl('/');
        },
        error: (err: unknown) => {
          const apiError = readApiError(err);
          this.formError.set(placeServerError(this.form, apiError));
          this.busy.set(false);
        },
      });
  }
}
