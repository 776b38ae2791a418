import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AuthApi } from '../../../core/auth/auth-api';
import { SessionStore } from '../../../core/auth/session-store';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';

@Component({
  selector: 'rw-sign-in-page',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './sign-in-page.html',
})
export class SignInPage {
  /** Where to go after signing in (set by the guards). */
  readonly next = input<string>();

  private readonly api = inject(AuthApi);
  private readonly session = inject(SessionStore);
  private readonly router = inject(Router);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required]],
  });
  private readonly submitter = new FormSubmitter(this.form);
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;
  protected readonly message = controlMessage;

  protected submit(): void {
    this.submitter.submit(
      () => this.api.signIn(this.form.getRawValue()),
      ({ user }) => {
        this.session.set(user);
        const next = this.next();
        void this.router.navigateByUrl(next && next.startsWith('/') && !next.startsWith('//') ? next : '/');
      },
    );
  }
}
