import { roles } from '@clearbase/contracts/values';
import { roleChoices, roleLabel } from './role-label';

describe('roleChoices', () => {
  it('offers exactly the contracts’ roles, in their order', () => {
    expect(roleChoices).toEqual(roles);
  });

  it('names every role for the screen', () => {
    expect(roles.map((r) => roleLabel(r))).toEqual(['Customer', 'Operator', 'Lab manager', 'Administrator']);
  });
});
