// Validators and readers shared by the bench-record forms (pure functions, tested in record-forms.spec.ts).
import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { readDecimal } from '../calculators/decimal';
import { decimalToMinor } from '@domain/quote';

/** An optional measurement: empty, or a decimal number from 0 to max in its unit. */
export function measurementValidator(max: number, unit: string): ValidatorFn {
  return (control: AbstractControl<string | null>): ValidationErrors | null => {
    const text = (control.value ?? '').trim();
    if (!text) return null;
    const r = readDecimal(text);
    if (!r || 'error' in r) return { measurement: `Enter a number in ${unit}, e.g. 13.2.` };
    if (r.value < 0 || r.value > max) return { measurement: `Give a value from 0 to ${max} ${unit}.` };
    return null;
  };
}

/** The number in an optional measurement field, or null when it is empty. */
export function optionalNumber(text: string | null | undefined): number | null {
  const r = readDecimal((text ?? '').trim());
  return r && 'value' in r ? r.value : null;
}

/** A quantity above zero with at most two decimals, up to 1000. */
export const quantityValidator: ValidatorFn = (control: AbstractControl<string | null>): ValidationErrors | null => {
  const r = readDecimal((control.value ?? '').trim());
  if (!r) return { quantity: 'Enter a quantity, e.g. 1 or 1.5.' };
  if ('error' in r) return { quantity: 'Enter the quantity as a number, e.g. 1.5.' };
  if (r.value <= 0 || r.value > 1000) return { quantity: 'Give a quantity above 0, up to 1000.' };
  if (Math.abs(r.value * 100 - Math.round(r.value * 100)) > 1e-6) return { quantity: 'Use at most two decimals, e.g. 1.25.' };
  return null;
};

/** A price in the club's currency, typed in major units ("12.50"). */
export function priceValidator(currency: () => string): ValidatorFn {
  return (control: AbstractControl<string | null>): ValidationErrors | null => {
    const text = (control.value ?? '').trim();
    if (!text) return { price: 'Enter a price, e.g. 12.50.' };
    return decimalToMinor(text, currency()) === null ? { price: `Enter a price in ${currency()}, e.g. 12.50 (no more decimals than the currency has).` } : null;
  };
}

/** The first message of a control's own errors (measurement, quantity, price, required, maxlength). */
export function recordFieldMessage(control: AbstractControl, label: string): string {
  const e = control.errors;
  if (!e) return '';
  if (typeof e['server'] === 'string') return e['server'];
  for (const k of ['measurement', 'quantity', 'price']) if (typeof e[k] === 'string') return e[k];
  if (e['required']) return `Enter ${label}.`;
  if (e['minlength']) return `Write a little more for ${label}.`;
  if (e['maxlength']) return `Keep ${label} to ${e['maxlength'].requiredLength} characters.`;
  return `Check ${label}.`;
}
