// Numbers typed on the Bench calculators page. The inputs are text fields (inputmode="decimal"),
// not type="number": a number field in some browsers and locales drops a comma it does not expect
// and reads "2,5" as 25. Here a decimal comma is read as the decimal point; what could be either a
// decimal comma or a thousands separator ("1,000") is refused with a message, never guessed.
import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

export type DecimalReading = { value: number } | { error: string } | null;

/** Reads what was typed: null when empty, the number, or a message saying what to type instead. */
export function readDecimal(text: string | null | undefined): DecimalReading {
  const typed = (text ?? '').trim().replace(/\s+/g, '');
  if (typed === '') return null;
  let normal = typed;
  if (typed.includes(',')) {
    if (typed.includes('.') || typed.indexOf(',') !== typed.lastIndexOf(',')) {
      return { error: 'Use one decimal mark and no thousands separators, e.g. 2.5 or 1000.' };
    }
    if (/^[+-]?\d{1,3},\d{3}$/.test(typed)) {
      const [whole, part] = typed.split(',');
      return { error: `Is this ${whole}.${part} or ${whole}${part}? Type it without the comma (${whole}${part}) or with a point (${whole}.${part}).` };
    }
    normal = typed.replace(',', '.');
  }
  if (!DECIMAL.test(normal)) return { error: 'Enter a number, e.g. 2.5.' };
  const value = Number(normal);
  if (!Number.isFinite(value)) return { error: 'Enter a number, e.g. 2.5.' };
  return { value };
}

/** The number in a control that passed `decimalValidator` (NaN otherwise). */
export function decimalValue(text: string | null | undefined): number {
  const reading = readDecimal(text);
  return reading && 'value' in reading ? reading.value : Number.NaN;
}

/** `required` when empty; `decimal: message` when the text is not a number this page can read. */
export const decimalValidator: ValidatorFn = (control: AbstractControl<string | null>): ValidationErrors | null => {
  const reading = readDecimal(control.value);
  if (reading === null) return { required: true };
  return 'error' in reading ? { decimal: reading.error } : null;
};
