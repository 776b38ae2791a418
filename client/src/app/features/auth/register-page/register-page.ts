import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { SessionStore } from '../../../core/auth/session-store';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
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
  private readonly submitter = new FormSubmitter(this.form);
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected submit(): void {
    this.submitter.submit(
      () => {
        const { email, displayName, callSign, password } = this.form.getRawValue();
        return this.api.register({
          email: email.trim(),
          displayName: displayName.trim(),
          password,
          ...(callSign.trim() ? { callSign: callSign.trim().toUpperCase() } : {}),
        });
      },
      ({ user }) => {
        this.session.set(user);
        void this.router.navigateByUrl('/');
      },
    );
  }
}
