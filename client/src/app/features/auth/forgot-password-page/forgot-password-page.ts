import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';

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
  private readonly submitter = new FormSubmitter(this.form);
  protected readonly busy = this.submitter.busy;
  protected readonly sent = signal(false);
  protected readonly formError = this.submitter.formError;
  protected readonly message = controlMessage;

  protected submit(): void {
    this.submitter.submit(
      () => this.api.requestPasswordReset(this.form.controls.email.value.trim()),
      () => this.sent.set(true),
    );
  }
}
