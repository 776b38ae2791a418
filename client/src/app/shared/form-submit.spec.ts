import { HttpErrorResponse } from '@angular/common/http';
import { FormControl, FormGroup, Validators } from '@angular/forms';
import { Observable, Subject, of, throwError } from 'rxjs';
import { FormSubmitter } from './form-submit';

describe('FormSubmitter', () => {
  function makeForm() {
    return new FormGroup({
      email: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] }),
      displayName: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    });
  }

  function fill(form: ReturnType<typeof makeForm>) {
    form.setValue({ email: 'orla@kestrelfen.example', displayName: 'Orla Fenwick' });
  }

  /** The API's error shape as the HTTP client hands it over. */
  function apiFailure(status: number, error: { code: string; message: string; fields?: Record<string, string> }) {
    return throwError(() => new HttpErrorResponse({ status, error: { error } }));
  }

  it('an invalid form sends no request, marks every control touched and leaves busy false', () => {
    const form = makeForm();
    const submitter = new FormSubmitter(form);
    const request = vi.fn(() => of('sent'));
    const onSuccess = vi.fn();

    submitter.submit(request, onSuccess);

    expect(request).not.toHaveBeenCalled();
    expect(onSuccess).not.toHaveBeenCalled();
    expect(form.controls.email.touched).toBe(true);
    expect(form.controls.displayName.touched).toBe(true);
    expect(submitter.busy()).toBe(false);
    expect(submitter.formError()).toBe('');
  });

  it('an invalid form shows the invalidMessage when one is given', () => {
    const form = makeForm();
    const submitter = new FormSubmitter(form, { invalidMessage: 'Some fields need attention.' });
    submitter.submit(() => of('sent'), () => undefined);
    expect(submitter.formError()).toBe('Some fields need attention.');
  });

  it('is busy while the request is in flight; on success busy is false and onSuccess gets the answer', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    submitter.formError.set('An old message.');
    const answer = new Subject<{ id: number }>();
    const onSuccess = vi.fn((value: { id: number }) => {
      // The page's own step already sees busy cleared (it may close a dialog or navigate).
      expect(submitter.busy()).toBe(false);
      return value;
    });

    submitter.submit(() => answer, onSuccess);
    expect(submitter.formError()).toBe('');
    expect(submitter.busy()).toBe(true);
    expect(onSuccess).not.toHaveBeenCalled();

    answer.next({ id: 42 });
    answer.complete();
    expect(onSuccess).toHaveBeenCalledTimes(1);
    expect(onSuccess).toHaveBeenCalledWith({ id: 42 });
    expect(submitter.busy()).toBe(false);
    expect(submitter.formError()).toBe('');
  });

  it('calls the request factory only once the form is valid, so it reads the current values', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    const seen: string[] = [];
    submitter.submit(
      () => {
        seen.push(form.controls.email.value);
        return of(null);
      },
      () => undefined,
    );
    expect(seen).toEqual(['orla@kestrelfen.example']);
  });

  it('a server field error lands on its control, busy goes false and nothing shows above the form', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    const onSuccess = vi.fn();

    submitter.submit(
      () => apiFailure(400, { code: 'validation_failed', message: 'Check the form.', fields: { email: 'That e-mail address is not valid.' } }),
      onSuccess,
    );

    expect(form.controls.email.errors).toEqual({ server: 'That e-mail address is not valid.' });
    expect(form.controls.email.touched).toBe(true);
    expect(form.controls.displayName.errors).toBeNull();
    expect(submitter.busy()).toBe(false);
    expect(submitter.formError()).toBe('');
    expect(onSuccess).not.toHaveBeenCalled();
  });

  it('a field error that matches no control is shown above the form', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    submitter.submit(
      () => apiFailure(400, { code: 'validation_failed', message: 'Check the form.', fields: { password: 'Too short.' } }),
      () => undefined,
    );
    expect(submitter.formError()).toBe('Too short.');
    expect(form.valid).toBe(true);
  });

  it('an error without fields sets formError to its message and leaves the controls alone', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    submitter.submit(() => apiFailure(401, { code: 'bad_credentials', message: 'The e-mail or password is wrong.' }), () => undefined);
    expect(submitter.formError()).toBe('The e-mail or password is wrong.');
    expect(submitter.busy()).toBe(false);
    expect(form.valid).toBe(true);
  });

  it('a failure with no API body (server unreachable) still reads as a plain message', () => {
    const form = makeForm();
    fill(form);
    const submitter = new FormSubmitter(form);
    submitter.submit(() => throwError(() => new HttpErrorResponse({ status: 0 })) as Observable<never>, () => undefined);
    expect(submitter.formError()).toBe('The bench server cannot be reached. Check the connection and try again.');
    expect(submitter.busy()).toBe(false);
  });

  it('errorMessage replaces the default text and receives the read API error', () => {
    const form = makeForm();
    fill(form);
    const errorMessage = vi.fn((error: { code: string }) => (error.code === 'reset_token_invalid' ? 'This link has expired.' : 'other'));
    const submitter = new FormSubmitter(form, { errorMessage });
    submitter.submit(() => apiFailure(400, { code: 'reset_token_invalid', message: 'Token invalid.' }), () => undefined);
    expect(errorMessage).toHaveBeenCalledWith({ status: 400, code: 'reset_token_invalid', message: 'Token invalid.', fields: {} });
    expect(submitter.formError()).toBe('This link has expired.');
    expect(submitter.busy()).toBe(false);
  });
});
