import { ValidatorFn, Validators } from '@angular/forms';

// reliability.md: 8+ characters, up to 128, no composition rules (the server also refuses common
// and club-specific words, which the client cannot know: those arrive as a field error).
export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 128;

export const passwordValidators: ValidatorFn[] = [
  Validators.required,
  Validators.minLength(PASSWORD_MIN),
  Validators.maxLength(PASSWORD_MAX),
];

export const PASSWORD_HINT = `At least ${PASSWORD_MIN} characters. A short sentence you will remember works well; no special characters needed.`;
