// Form rules and conversions of the bench records, as plain functions the specs test directly.
import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

/**
 * A money amount typed as the club writes it ("12.50", "12", "0.5") → integer minor units (1250,
 * 1200, 50), by string arithmetic (no floating point). Two decimals: the minor unit of the usual
 * currencies (pence, cents). Null for anything else.
 */
export function toMinorUnits(text: string): number | null {
  const m = /^\s*(\d{1,7})(?:[.,](\d{1,2}))?\s*$/.exec(text ?? '');
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

/** Integer minor units → "12.50" (integer arithmetic only). */
export function formatMinor(minor: number): string {
  const abs = Math.abs(Math.trunc(minor));
  return `${minor < 0 ? '-' : ''}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

/** A control holding a money amount: `{ money: true }` unless `toMinorUnits` can read it. */
export const moneyValidator: ValidatorFn = (control: AbstractControl): ValidationErrors | null =>
  control.value === '' || control.value === null || toMinorUnits(String(control.value)) !== null ? null : { money: true };

/** MHz as typed → whole Hz (null for an empty field). */
export function mhzToHz(value: number | null | string): number | null {
  if (value === null || value === '' || value === undefined) return null;
  const n = Number(value);
  return Number.isFinite(n) ? Math.round(n * 1e6) : null;
}

/**
 * A band line's own rules, before the server sees it: reflected power below forward power (into a
 * passive load it cannot be more; equal means no load at all), and the dialled and measured
 * frequencies both or neither. Errors go on the group: `reflectedNotBelowForward`, `frequencyPair`.
 */
export const bandLineValidator: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const v = group.value as { forwardW: number | null; reflectedW: number | null; nominalMHz: number | null | string; measuredMHz: number | null | string };
  const errors: ValidationErrors = {};
  if (v.forwardW !== null && v.reflectedW !== null && Number(v.reflectedW) >= Number(v.forwardW) && Number(v.forwardW) > 0) {
    errors['reflectedNotBelowForward'] = true;
  }
  const hasNominal = v.nominalMHz !== null && v.nominalMHz !== '';
  const hasMeasured = v.measuredMHz !== null && v.measuredMHz !== '';
  if (hasNominal !== hasMeasured) errors['frequencyPair'] = true;
  return Object.keys(errors).length ? errors : null;
};

/** A checklist line: an item that does not go back needs a note saying why (`noteNeeded`). */
export const handBackItemValidator: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const v = group.value as { returned: boolean; note: string };
  return !v.returned && (v.note ?? '').trim().length < 3 ? { noteNeeded: true } : null;
};
