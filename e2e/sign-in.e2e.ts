import { describe, expect, it } from 'vitest';
import { useBrowserApp } from './support/browser-app';

// What each role's navigation holds; admins alone see users and the audit log.
const expectedNav: Record<string, { has: string[]; lacks: string[] }> = {
  customer: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  operator: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  manager: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  admin: { has: ['nav-home', 'nav-account', 'nav-users', 'nav-audit'], lacks: [] },
};

const app = useBrowserApp();

describe('signing in', () => {
  it('sends a visitor who is not signed in to the sign-in page with a return address', async () => {
    const { page } = app.browser;
    await page.goto(`${app.url}/admin/users`);
    await page.getByTestId('sign-in-email').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(new URL(page.url()).searchParams.get('returnUrl')).toBe('/admin/users');
    await app.browser.screenshot('sign-in');
  });

  it('says the same thing for a wrong password as for an unknown e-mail', async () => {
    const { page } = app.browser;
    await app.submitSignIn('operator@clearbase.test', 'not-the-password');
    const wrongPassword = await page.getByTestId('sign-in-error').innerText();
    await app.submitSignIn('nobody@clearbase.test', 'not-the-password');
    const unknownEmail = await page.getByTestId('sign-in-error').innerText();
    expect(wrongPassword.length).toBeGreaterThan(0);
    expect(unknownEmail).toBe(wrongPassword);
  });

  for (const [role, nav] of Object.entries(expectedNav)) {
    it(`shows the ${role} only the navigation the ${role} role allows`, async () => {
      const { page } = app.browser;
      await app.signIn(`${role}@clearbase.test`);
      const names = await page
        .locator('[data-testid^="nav-"]')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
      for (const name of nav.has) expect(names).toContain(name);
      for (const name of nav.lacks) expect(names).not.toContain(name);
      await app.browser.screenshot(`home-${role}`);
      if (role === 'admin') {
        await page.getByTestId('nav-users').click();
        await page.locator('[data-testid^="user-row-"]').first().waitFor();
        await app.browser.screenshot('admin-users');
        await page.getByTestId('nav-audit').click();
        await page.getByTestId('audit-table').waitFor();
        await page.locator('[data-testid^="audit-row-"]').first().waitFor();
        await app.browser.screenshot('admin-audit');
      }
      await app.signOut();
    });
  }

  it('loads nothing from any other origin', () => {
    expect(app.browser.foreignRequests).toEqual([]);
  });
});
