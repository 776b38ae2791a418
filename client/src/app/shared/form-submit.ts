import { Signal, WritableSignal, signal } from '@angular/core';
import { FormGroup } from '@angular/forms';
import { Observable } from 'rxjs';
import { ApiError, readApiError } from '../core/http/api-error';
import { placeServerError } from './form-errors';

export interface FormSubmitOptions {
  /**
   * The message above the form when it is sent while invalid. Default: none (the messages under
   * the fields speak for themselves).
   */
  invalidMessage?: string;
  /**
   * The message above the form for a failed request. Default: `placeServerError(form, error)`
   * (field messages on their controls, the rest above the form). A page that replaces it and
   * still wants the field messages placed calls `placeServerError` itself.
   */
  errorMessage?: (error: ApiError) => string;
}

/**
 * The one way a form is sent: clear the message above the form; if the form is invalid, mark every
 * control touched and stop; otherwise set `busy`, send the request, and on success clear `busy` and
 * hand the answer to the page; on error clear `busy` and place the API error on the form.
 * Templates bind to `busy()` and `formError()`.
 */
export class FormSubmitter {
  private readonly busyState = signal(false);
  /** True while a request is in flight (disable the submit button). */
  readonly busy: Signal<boolean> = this.busyState.asReadonly();
  /** The message above the form; '' when there is none. Writable so a page can add its own checks. */
  readonly formError: WritableSignal<string> = signal('');

  constructor(
    private readonly form: FormGroup,
    private readonly options: FormSubmitOptions = {},
  ) {}

  /** `request` is called only once the form is valid, so it may read the form's values. */
  submit<T>(request: () => Observable<T>, onSuccess: (value: T) => void): void {
    this.formError.set('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      if (this.options.invalidMessage) this.formError.set(this.options.invalidMessage);
      return;
    }
    this.busyState.set(true);
    request().subscribe({
      next: (value) => {
        this.busyState.set(false);
        onSuccess(value);
      },
      error: (err: unknown) => {
        this.busyState.set(false);
        const apiError = readApiError(err);
        const errorMessage = this.options.errorMessage;
        this.formError.set(errorMessage ? errorMessage(apiError) : placeServerError(this.form, apiError));
      },
    });
  }
}
