// Recomputing a calculator card as the person types: debounced, newest answer wins, server field
// errors placed on their controls. Shared by every card of the Bench calculators page.
import { DestroyRef, InjectionToken, Signal, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { AbstractControl, FormGroup } from '@angular/forms';
import { Observable, catchError, debounceTime, map, of, startWith, switchMap } from 'rxjs';
import { readApiError } from '../../core/http/api-error';
import { controlMessage, placeServerError } from '../../shared/form-errors';

/** Wait this long (ms) after the last keystroke before asking the server. Tests set it to 0. */
export const RECOMPUTE_DEBOUNCE_MS = new InjectionToken<number>('RECOMPUTE_DEBOUNCE_MS', { factory: () => 300 });

/** What a calculator card shows: its figures, or a message that is not about one field. */
export interface CalcState<R> {
  result: R | null;
  message: string;
}

/**
 * Asks the API again whenever the form settles (debounced), dropping answers to older values
 * (switchMap). Server field errors go onto their controls (`fieldAliases` maps an API field name
 * to a control name); anything else becomes the message.
 */
export function recomputeOnChange<F extends FormGroup, R>(
  form: F,
  call: (value: ReturnType<F['getRawValue']>) => Observable<R>,
  opts: { debounceMs: number; destroyRef: DestroyRef; fieldAliases?: Record<string, string> },
): Signal<CalcState<R>> {
  const aliases = opts.fieldAliases ?? {};
  const state = signal<CalcState<R>>({ result: null, message: '' });
  form.valueChanges
    .pipe(
      startWith(null),
      debounceTime(opts.debounceMs),
      map(() => {
        clearServerErrors(form);
        return form.valid ? (form.getRawValue() as ReturnType<F['getRawValue']>) : null;
      }),
      switchMap((value) => {
        if (value === null) return of<CalcState<R>>({ result: null, message: '' });
        return call(value).pipe(
          map((result): CalcState<R> => ({ result, message: '' })),
          catchError((err: unknown) => {
            const apiError = readApiError(err);
            const fields: Record<string, string> = {};
            for (const [name, text] of Object.entries(apiError.fields)) fields[aliases[name] ?? name] = text;
            return of<CalcState<R>>({ result: null, message: placeServerError(form, { message: apiError.message, fields }) });
          }),
        );
      }),
      takeUntilDestroyed(opts.destroyRef),
    )
    .subscribe((next) => state.set(next));
  return state.asReadonly();
}

/** Drops the server's messages so the form's own validators decide again. */
function clearServerErrors(form: FormGroup): void {
  for (const control of Object.values(form.controls)) {
    if (control.hasError('server')) control.updateValueAndValidity({ emitEvent: false });
  }
  form.updateValueAndValidity({ emitEvent: false });
}

/** The message under a calculator field: the decimal reader's own words first, then the usual ones. */
export function calcFieldMessage(control: AbstractControl, label: string): string {
  const errors = control.errors;
  if (errors && typeof errors['server'] !== 'string' && typeof errors['decimal'] === 'string') return errors['decimal'];
  return controlMessage(control, label);
}
