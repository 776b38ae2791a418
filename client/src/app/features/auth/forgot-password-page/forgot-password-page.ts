import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { readApiError } from '../../../core/http/api-error';
import { controlMessage, placeServerError } from '../../../shared/form-errors';

@Component({
  selector: 'rw-forgot-password-page',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './forgot-password-page.html',
})
export class ForgotPasswordPage {
  private readonly api = inject(AuthApi);
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
  });
  protected readonly busy = signal(false);
  protected readonly sent = signal(false);
  protected readonly formError = signal('');
  protected readonly message = controlMessage;

  protected submit(): void {
    this.formError.set('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api.requestPasswordReset(this.form.controls.email.value.trim()).subscribe({
      next: () => {
        this.sent.set(true);
        this.busy.set(false);
      },
      error: (err: unknown) => {
        const apiError = readApiError(err);
        this.formError.set(placeServerError(this.form, apiError));
        this.busy.set(false);
      },
    });
  }
}
