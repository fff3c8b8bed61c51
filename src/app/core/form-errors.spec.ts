import { FormControl, FormGroup } from '@angular/forms';
import { ApiError } from './api-errors';
import { applyFieldErrors, applyServerErrors, messageFor, serverError } from './form-errors';

describe('applyServerErrors', () => {
  const form = () =>
    new FormGroup({
      name: new FormControl('', { nonNullable: true }),
      yearlyPrice: new FormControl('', { nonNullable: true }),
      property: new FormGroup({ zip: new FormControl('', { nonNullable: true }) }),
    });

  it('puts each field message under its own control, through dotted paths and renamed fields', () => {
    const f = form();
    const rest = applyServerErrors(
      f,
      new ApiError(400, 'invalid', 'Please check the form.', { name: 'Name is needed.', 'property.zip': 'ZIP code has 5 digits.', yearlyPriceCents: 'Enter a price.' }),
      {
        yearlyPriceCents: 'yearlyPrice',
      },
    );
    expect(rest).toBeNull();
    expect(serverError(f.controls.name)).toBe('Name is needed.');
    expect(serverError(f.get('property.zip'))).toBe('ZIP code has 5 digits.');
    expect(serverError(f.controls.yearlyPrice)).toBe('Enter a price.');
    expect(f.controls.name.touched).toBe(true);
  });

  it('returns the message when part of the answer belongs to no field, or there are no fields', () => {
    const f = form();
    expect(applyServerErrors(f, new ApiError(409, 'conflict', 'Someone else changed this.', { name: 'Taken.', other: 'Not a field.' }))).toBe('Someone else changed this.');
    expect(serverError(f.controls.name)).toBe('Taken.');
    expect(applyServerErrors(f, new ApiError(0, 'offline', 'We could not reach Seasonwell.'))).toBe('We could not reach Seasonwell.');
    expect(applyServerErrors(f, new Error('boom'))).toBe('boom');
  });

  it('lists the keys no control took, and a typed value clears the server message', () => {
    const f = form();
    expect(applyFieldErrors(f, { name: 'Name is needed.', nope: 'x' })).toEqual(['nope']);
    expect(messageFor(f, 'name', { required: 'This is needed.' })).toBe('Name is needed.');
    f.controls.name.setValue('Whitfield');
    expect(serverError(f.controls.name)).toBeNull();
    expect(messageFor(f, 'name', {})).toBe('');
  });
});
