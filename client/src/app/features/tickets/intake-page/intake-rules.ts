// The intake stepper's own rules, as plain validators (unit-tested in intake-rules.spec.ts). The
// server checks the same again (api/src/modules/tickets/tickets.schemas.ts); messages say the same.
import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

export type OwnerMode = 'self' | 'member' | 'walkIn';
export type UpdatesChoice = 'email' | 'phone' | 'none';

export const CONTACT_MESSAGE = 'Give an e-mail address or a phone number, so the bench can reach the owner.';
export const PHONE_MESSAGE = 'Give a phone number in digits, like 01632 960417 or +44 1632 960417.';
export const MEMBER_MESSAGE = 'Choose the member from the list (type part of their name, e-mail or call sign).';
export const SYMPTOM_MESSAGE = 'Tick at least one symptom; tick Other if none fits.';
export const EMAIL_UPDATES_MESSAGE = 'Updates by e-mail need the owner’s e-mail address: give one, or choose phone or none.';
export const PHONE_UPDATES_MESSAGE = 'Updates by phone need the owner’s phone number: give one, or choose e-mail or none.';

const PHONE = /^\+?[0-9 ()./-]{5,40}$/;

/** A phone number as the server takes it: digits with spaces, brackets, dots, dashes; at least 5 digits. */
export const phoneValidator: ValidatorFn = (control: AbstractControl<string>): ValidationErrors | null => {
  const v = (control.value ?? '').trim();
  if (!v) return null;
  return PHONE.test(v) && v.replace(/[^0-9]/g, '').length >= 5 ? null : { phone: PHONE_MESSAGE };
};

interface OwnerValue {
  mode: OwnerMode;
  accountId: number | null;
  name: string;
  email: string;
  phone: string;
}

/** The owner step: a chosen member needs an account; someone at the bench needs an e-mail or a phone. */
export const ownerStepValidator: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const v = group.getRawValue() as OwnerValue;
  if (v.mode === 'member' && !v.accountId) return { member: MEMBER_MESSAGE };
  if (v.mode === 'walkIn' && !v.email.trim() && !v.phone.trim()) return { contact: CONTACT_MESSAGE };
  return null;
};

/** At least one ticked. */
export const someTicked: ValidatorFn = (control: AbstractControl<string[]>): ValidationErrors | null =>
  control.value.length ? null : { symptoms: SYMPTOM_MESSAGE };

/** Whether the chosen way of updates can reach this owner (only someone at the bench can lack one). */
export function updatesProblem(updatesBy: UpdatesChoice | '', owner: Pick<OwnerValue, 'mode' | 'email' | 'phone'>): string | null {
  if (owner.mode !== 'walkIn') return null;
  if (updatesBy === 'email' && !owner.email.trim()) return EMAIL_UPDATES_MESSAGE;
  if (updatesBy === 'phone' && !owner.phone.trim()) return PHONE_UPDATES_MESSAGE;
  return null;
}
