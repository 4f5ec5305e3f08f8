import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { fieldErrorsFrom } from '@/lib/form-errors';
import { describeRoles, hasRole } from '@/lib/auth';

describe('fieldErrorsFrom', () => {
  it('reads zod issues from validation_failed details', () => {
    const error = new ApiError(400, 'validation_failed', 'Check the fields', [
      { path: ['email'], message: 'Enter a valid e-mail address' },
      { path: ['roles'], message: 'Choose at least one role' },
      { path: ['email'], message: 'second message is ignored' },
    ]);
    expect(fieldErrorsFrom(error)).toEqual({ email: 'Enter a valid e-mail address', roles: 'Choose at least one role' });
  });

  it('reads field maps, with or without fieldErrors', () => {
    expect(fieldErrorsFrom(new ApiError(400, 'validation_failed', 'x', { name: 'Enter a name' }))).toEqual({ name: 'Enter a name' });
    expect(fieldErrorsFrom(new ApiError(400, 'validation_failed', 'x', { fieldErrors: { name: ['Too long', 'Other'] } }))).toEqual({ name: 'Too long' });
  });

  it('ignores other errors and unknown shapes', () => {
    expect(fieldErrorsFrom(new ApiError(409, 'conflict', 'Exists', { email: 'x' }))).toEqual({});
    expect(fieldErrorsFrom(new ApiError(400, 'validation_failed', 'x', 'text'))).toEqual({});
    expect(fieldErrorsFrom(new Error('plain'))).toEqual({});
  });
});

describe('roles', () => {
  it('hasRole is true when the person holds any of the roles', () => {
    expect(hasRole({ roles: ['modeler', 'policy'] }, 'admin', 'policy')).toBe(true);
    expect(hasRole({ roles: ['modeler'] }, 'admin')).toBe(false);
    expect(hasRole(null, 'admin')).toBe(false);
    expect(hasRole({ roles: ['admin'] })).toBe(false);
  });

  it('describeRoles joins role labels in words', () => {
    expect(describeRoles(['admin'])).toBe('Administrator');
    expect(describeRoles(['modeler', 'analyst'], 'or')).toBe('Modeler or Analyst (validation)');
    expect(describeRoles(['modeler', 'policy', 'committee'])).toBe('Modeler, Credit policy and Committee');
  });
});
