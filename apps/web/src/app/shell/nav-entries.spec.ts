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

  it('gives lab staff the customers and the scanners too, but no admin pages', () => {
    for (const role of ['operator', 'manager'] as const) {
      expect(navEntriesFor(role, { localFakes: true }).map((e) => e.name)).toEqual([
        'home',
        'orders',
        'customers',
        'catalogue',
        'scanners',
        'calibration',
        'prices',
        'account',
      ]);
    }
  });

  it('adds users, the audit log, the outbox and, while the local fakes run, the development mailbox for admins', () => {
    expect(navEntriesFor('admin', { localFakes: true }).map((e) => e.name)).toEqual([
      'home',
      'orders',
      'customers',
      'catalogue',
      'scanners',
      'calibration',
      'prices',
      'users',
      'audit',
      'outbox',
      'dev-mailbox',
      'account',
    ]);
  });

  it('leaves the development mailbox out when the local fakes are off', () => {
    const names = navEntriesFor('admin', { localFakes: false }).map((e) => e.name);
    expect(names).not.toContain('dev-mailbox');
    expect(names).toContain('outbox');
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
    expect(navEntriesFor('operator', { localFakes: false }, entries).map((e) => e.name)).toEqual(['rolls']);
    expect(navEntriesFor('customer', { localFakes: false }, entries)).toEqual([]);
  });
});
