import { FormArray, FormControl, FormGroup, Validators } from '@angular/forms';
import { applyServerErrors, controlMessage } from './form-errors';

describe('applyServerErrors', () => {
  function makeForm() {
    return new FormGroup({
      makeModel: new FormControl('', { nonNullable: true }),
      units: new FormControl<string[]>([], { nonNullable: true }),
      owner: new FormGroup({ email: new FormControl('', { nonNullable: true }) }),
      tags: new FormArray([new FormControl('a')]),
    });
  }

  it('puts each message on its control, marks it touched, and returns what matched nothing', () => {
    const form = makeForm();
    const unplaced = applyServerErrors(form, {
      makeModel: 'Make and model is too long.',
      'owner.email': 'That e-mail address is not valid.',
      'units.3': 'A unit name is too long.',
      'tags.0': 'Bad tag.',
      somethingElse: 'The bench is closed.',
    });
    expect(form.controls.makeModel.errors).toEqual({ server: 'Make and model is too long.' });
    expect(form.controls.makeModel.touched).toBe(true);
    expect(form.controls.owner.controls.email.errors).toEqual({ server: 'That e-mail address is not valid.' });
    expect(form.controls.units.errors).toEqual({ server: 'A unit name is too long.' });
    expect(form.controls.tags.at(0).errors).toEqual({ server: 'Bad tag.' });
    expect(unplaced).toEqual(['The bench is closed.']);
    expect(form.valid).toBe(false);
  });

  it('the server error clears when the person edits the field', () => {
    const form = makeForm();
    applyServerErrors(form, { makeModel: 'Too long.' });
    form.controls.makeModel.setValue('QX-7');
    expect(form.controls.makeModel.errors).toBeNull();
  });
});

describe('controlMessage', () => {
  it('words each validator failure plainly', () => {
    const c = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(5)] });
    expect(controlMessage(c, 'the fault as reported')).toBe('Enter the fault as reported.');
    c.setValue('dead');
    expect(controlMessage(c, 'the fault as reported')).toBe('Fault as reported needs at least 5 characters.');
    c.setValue('dead screen');
    expect(controlMessage(c, 'the fault as reported')).toBe('');
    const e = new FormControl('x', { nonNullable: true, validators: [Validators.email] });
    expect(controlMessage(e, 'your e-mail')).toBe('Enter an e-mail address such as name@kestrelfen.example.');
    e.setErrors({ server: 'That address already has an account.' });
    expect(controlMessage(e, 'your e-mail')).toBe('That address already has an account.');
  });
});
