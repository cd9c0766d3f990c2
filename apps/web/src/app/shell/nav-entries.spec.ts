import { navEntriesFor } from './nav-entries';

describe('navEntriesFor', () => {
  it('shows nothing to a visitor who is not signed in', () => {
    expect(navEntriesFor(null)).toEqual([]);
  });

  it('gives customers home, their orders, the film stocks, prices and account', () => {
    expect(navEntriesFor('customer').map((e) => e.name)).toEqual([
      'home',
      'orders',
      'catalogue',
      'prices',
      'account',
    ]);
  });

  it('gives lab staff the scanners too, but no admin pages', () => {
    for (const role of ['operator', 'manager'] as const) {
      expect(navEntriesFor(role).map((e) => e.name)).toEqual([
        'home',
        'orders',
        'catalogue',
        'scanners',
        'calibration',
        'prices',
        'account',
      ]);
    }
  });

  it('adds users, the audit log and the development mailbox for admins', () => {
    expect(navEntriesFor('admin').map((e) => e.name)).toEqual([
      'home',
      'orders',
      'catalogue',
      'scanners',
      'calibration',
      'prices',
      'users',
      'audit',
      'dev-mailbox',
      'account',
    ]);
  });

  it('reads the roles from the list it is given, so features add pages by adding lines', () => {
    const entries = [
      {
        name: 'rolls',
        label: 'Rolls',
        icon: 'film',
        path: '/rolls',
        roles: ['operator'] as const,
        group: 'work' as const,
      },
    ];
    expect(navEntriesFor('operator', entries).map((e) => e.name)).toEqual(['rolls']);
    expect(navEntriesFor('customer', entries)).toEqual([]);
  });
});
