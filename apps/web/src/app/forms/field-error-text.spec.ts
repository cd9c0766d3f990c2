import { fieldErrorText } from './field-error-text';

describe('fieldErrorText', () => {
  it('says nothing for a valid field', () => {
    expect(fieldErrorText(null)).toBe('');
  });

  it('lets the server’s own words win over any local check', () => {
    expect(fieldErrorText({ required: true, server: 'Name already used' })).toBe('Name already used');
  });

  it('names the limit a number broke', () => {
    expect(fieldErrorText({ min: { min: 6, actual: 3 } })).toBe('At least 6');
    expect(fieldErrorText({ max: { max: 25600, actual: 30000 } })).toBe('At most 25600');
    expect(fieldErrorText({ min: { min: Number.MIN_VALUE, actual: 0 } })).toBe('Above 0');
  });

  it('names the length a text broke', () => {
    expect(fieldErrorText({ maxlength: { requiredLength: 40, actualLength: 41 } })).toBe(
      'At most 40 characters',
    );
  });

  it('uses the form’s own words for a pattern, and a plain request otherwise', () => {
    expect(fieldErrorText({ pattern: {} }, { pattern: 'A whole number' })).toBe('A whole number');
    expect(fieldErrorText({ pattern: {} })).toBe('Check this value');
  });
});
