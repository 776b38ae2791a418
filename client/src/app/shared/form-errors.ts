import { AbstractControl, FormGroup } from '@angular/forms';

/**
 * Copies the server's `error.fields` onto the matching controls (as error `server`), so each message
 * appears under its own field. Field names may be dotted paths ("owner.email") or point into an
 * array ("units.2"); the nearest control that exists gets the message. Returns the messages that
 * matched no control, for a message above the form.
 */
export function applyServerErrors(form: FormGroup, fields: Record<string, string>): string[] {
  const unplaced: string[] = [];
  for (const [path, message] of Object.entries(fields)) {
    const control = findControl(form, path);
    if (control) {
      control.setErrors({ ...(control.errors ?? {}), server: message });
      control.markAsTouched();
    } else {
      unplaced.push(message);
    }
  }
  return unplaced;
}

function findControl(form: FormGroup, path: string): AbstractControl | null {
  const parts = path.split('.').filter((p) => p.length > 0);
  while (parts.length > 0) {
    const control = form.get(parts.join('.'));
    if (control) return control;
    parts.pop();
  }
  return null;
}

/**
 * The message to show under a control, in plain words. `label` names the field in a sentence,
 * lower case ("the make and model"). The server's own message wins when present.
 */
export function controlMessage(control: AbstractControl, label: string): string {
  const errors = control.errors;
  if (!errors) return '';
  if (typeof errors['server'] === 'string') return errors['server'];
  if (errors['required']) return `Enter ${label}.`;
  if (errors['requiredTrue']) return `Tick the box to confirm ${label}.`;
  if (errors['email']) return 'Enter an e-mail address such as name@kestrelfen.example.';
  if (errors['minlength']) {
    return `${capitalise(label)} needs at least ${errors['minlength'].requiredLength} characters.`;
  }
  if (errors['maxlength']) {
    return `${capitalise(label)} can have at most ${errors['maxlength'].requiredLength} characters.`;
  }
  if (errors['maxItems']) return `At most ${errors['maxItems'].max} ${label}.`;
  if (errors['pattern']) return `Check ${label}: it is not in the expected form.`;
  return `Check ${label}.`;
}

function capitalise(text: string): string {
  const stripped = text.replace(/^the /, '');
  return stripped.charAt(0).toUpperCase() + stripped.slice(1);
}

/**
 * Places an API error on a form: field messages on their controls, and returns the text for a
 * message above the form (the field messages that matched nothing, or the general message when
 * the error had no fields at all; empty when everything found its control).
 */
export function placeServerError(form: FormGroup, error: { message: string; fields: Record<string, string> }): string {
  const fieldCount = Object.keys(error.fields).length;
  if (fieldCount === 0) return error.message;
  return applyServerErrors(form, error.fields).join(' ');
}
