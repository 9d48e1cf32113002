import { expect } from 'vitest';
import { UserError } from '../../src/errors.js';

/** The UserError that `fn` throws; fails the test when it throws nothing or something else. */
export function refusal(fn: () => unknown): UserError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(UserError);
    return e as UserError;
  }
  throw new Error('expected a UserError');
}
