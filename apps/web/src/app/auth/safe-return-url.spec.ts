import { safeReturnUrl } from './safe-return-url';

describe('safeReturnUrl', () => {
  it('keeps a path inside the app', () => {
    expect(safeReturnUrl('/admin/users?x=1')).toBe('/admin/users?x=1');
  });

  it('goes home for other origins, protocol-relative URLs, the sign-in page and nothing', () => {
    for (const bad of [
      'https://elsewhere.test/',
      '//elsewhere.test',
      '/\\elsewhere.test',
      '/sign-in',
      '',
      null,
      undefined,
    ]) {
      expect(safeReturnUrl(bad)).toBe('/');
    }
  });
});
