import { FormControl, FormGroup } from '@angular/forms';
import { applyFieldProblems, bodyField, bodyPath } from './apply-field-problems';

describe('applyFieldProblems', () => {
  it('marks the control a complaint is about and returns the complaints no control claims', () => {
    const form = new FormGroup({ iso: new FormControl(100) });

    const rest = applyFieldProblems({ 'body.iso': 'Too fast', 'body.other': 'Unknown' }, (path) =>
      form.get(bodyField(path)),
    );

    expect(form.controls.iso.errors).toEqual({ server: 'Too fast' });
    expect(form.controls.iso.touched).toBe(true);
    expect(rest).toEqual(['body.other: Unknown']);
  });
});

describe('bodyField and bodyPath', () => {
  it('take the top-level field, or the whole path, after body.', () => {
    expect(bodyField('body.inputProfile.gains.1')).toBe('inputProfile');
    expect(bodyPath('body.inputProfile.gains.1')).toBe('inputProfile.gains.1');
  });
});
