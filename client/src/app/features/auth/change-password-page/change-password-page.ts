import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { AuthApi } from '../../../core/auth/auth-api';
import { Notifier } from '../../../core/notifier';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
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
  private readonly submitter = new FormSubmitter(this.form);
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;
  protected readonly message = controlMessage;
  protected readonly passwordHint = PASSWORD_HINT;

  protected submit(): void {
    this.submitter.submit(
      () => this.api.changePassword(this.form.getRawValue()),
      () => {
        this.form.reset();
        this.notifier.info('Password changed. You stay signed in here; other devices are signed out.');
      },
    );
  }
}
