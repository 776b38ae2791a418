import { FormControl, FormGroup } from '@angular/forms';
import {
  CONTACT_MESSAGE,
  EMAIL_UPDATES_MESSAGE,
  MEMBER_MESSAGE,
  PHONE_MESSAGE,
  PHONE_UPDATES_MESSAGE,
  SYMPTOM_MESSAGE,
  ownerStepValidator,
  phoneValidator,
  someTicked,
  updatesProblem,
} from './intake-rules';

function owner(v: { mode: string; accountId?: number | null; name?: string; email?: string; phone?: string }) {
  return new FormGroup(
    {
      mode: new FormControl(v.mode, { nonNullable: true }),
      accountId: new FormControl<number | null>(v.accountId ?? null),
      name: new FormControl(v.name ?? '', { nonNullable: true }),
      email: new FormControl(v.email ?? '', { nonNullable: true }),
      phone: new FormControl(v.phone ?? '', { nonNullable: true }),
    },
    { validators: ownerStepValidator },
  );
}

describe('intake rules', () => {
  it('someone at the bench needs an e-mail or a phone; either alone will do', () => {
    expect(owner({ mode: 'walkIn', name: 'Edmund Rushby' }).errors).toEqual({ contact: CONTACT_MESSAGE });
    expect(owner({ mode: 'walkIn', name: 'Edmund Rushby', phone: '01632 960417' }).errors).toBeNull();
    expect(owner({ mode: 'walkIn', name: 'Edmund Rushby', email: 'e@fenmail.example' }).errors).toBeNull();
  });

  it('a member must be chosen from the list; handing in for oneself needs nothing more', () => {
    expect(owner({ mode: 'member' }).errors).toEqual({ member: MEMBER_MESSAGE });
    expect(owner({ mode: 'member', accountId: 12 }).errors).toBeNull();
    expect(owner({ mode: 'self' }).errors).toBeNull();
  });

  it('phone numbers are digits with the usual separators, at least five digits', () => {
    for (const ok of ['01632 960417', '+44 1632 960417', '(01632) 960-417', '']) expect(phoneValidator(new FormControl(ok))).toBeNull();
    for (const bad of ['call me', '12-34', '01632 960417 ext. 4']) expect(phoneValidator(new FormControl(bad))).toEqual({ phone: PHONE_MESSAGE });
  });

  it('at least one symptom', () => {
    expect(someTicked(new FormControl<string[]>([], { nonNullable: true }))).toEqual({ symptoms: SYMPTOM_MESSAGE });
    expect(someTicked(new FormControl(['other'], { nonNullable: true }))).toBeNull();
  });

  it('updates must be able to reach the owner', () => {
    expect(updatesProblem('email', { mode: 'walkIn', email: '', phone: '01632 960417' })).toBe(EMAIL_UPDATES_MESSAGE);
    expect(updatesProblem('phone', { mode: 'walkIn', email: 'e@fenmail.example', phone: '' })).toBe(PHONE_UPDATES_MESSAGE);
    expect(updatesProblem('none', { mode: 'walkIn', email: '', phone: '01632 960417' })).toBeNull();
    expect(updatesProblem('email', { mode: 'self', email: '', phone: '' })).toBeNull();
  });
});
