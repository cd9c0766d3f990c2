import { accountFieldMessage } from './account-field-message';

describe('accountFieldMessage', () => {
  it('asks for what is missing in the words of each field', () => {
    expect(accountFieldMessage('name', { required: true })).toBe('Enter your name');
    expect(accountFieldMessage('email', { required: true })).toBe('Enter your e-mail address');
    expect(accountFieldMessage('password', { required: true })).toBe('Enter your password');
    expect(accountFieldMessage('new-password', { required: true })).toBe('Choose a password');
    expect(accountFieldMessage('repeat-password', { required: true })).toBe('Type the password again');
  });

  it('takes the words given for a form filled in for someone else', () => {
    expect(accountFieldMessage('email', { required: true }, { required: 'Enter an e-mail address' })).toBe(
      'Enter an e-mail address',
    );
    expect(
      accountFieldMessage(
        'repeat-password',
        { mismatch: true },
        { mismatch: 'The two new passwords differ' },
      ),
    ).toBe('The two new passwords differ');
  });

  it('puts the server’s words first, then a missing value, a repeat that differs and the other checks', () => {
    expect(accountFieldMessage('email', { server: 'Already has an account', email: true })).toBe(
      'Already has an account',
    );
    expect(accountFieldMessage('repeat-password', { mismatch: true, required: true })).toBe(
      'Type the password again',
    );
    expect(accountFieldMessage('repeat-password', { mismatch: true })).toBe('The two passwords differ');
    expect(accountFieldMessage('email', { email: true })).toBe('Enter a valid e-mail address');
    expect(accountFieldMessage('new-password', { minlength: { requiredLength: 10, actualLength: 3 } })).toBe(
      'Use at least 10 characters',
    );
    expect(accountFieldMessage('name', { maxlength: { requiredLength: 120, actualLength: 130 } })).toBe(
      'At most 120 characters',
    );
    expect(accountFieldMessage('name', null)).toBe('');
  });
});
