import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, type BrowserSession } from './support/browser-session';
import { startTestServer, type TestServer } from './support/test-server';

const demoPassword = 'clearbase-demo';

// What each role's navigation holds; admins alone see users and the audit log.
const expectedNav: Record<string, { has: string[]; lacks: string[] }> = {
  customer: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  operator: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  manager: { has: ['nav-home', 'nav-account'], lacks: ['nav-users', 'nav-audit'] },
  admin: { has: ['nav-home', 'nav-account', 'nav-users', 'nav-audit'], lacks: [] },
};

let server: TestServer;
let browser: BrowserSession;

beforeAll(async () => {
  server = await startTestServer();
  browser = await openBrowser(server.url);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function signIn(email: string, password: string): Promise<void> {
  const { page } = browser;
  await page.goto(`${server.url}/sign-in`);
  await page.getByTestId('sign-in-email').fill(email);
  await page.getByTestId('sign-in-password').fill(password);
  await page.getByTestId('sign-in-submit').click();
}

async function signOut(): Promise<void> {
  const { page } = browser;
  await page.getByTestId('user-menu').click();
  await page.getByTestId('sign-out').click();
  await page.getByTestId('sign-in-email').waitFor();
}

describe('signing in', () => {
  it('sends a visitor who is not signed in to the sign-in page with a return address', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/admin/users`);
    await page.getByTestId('sign-in-email').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(new URL(page.url()).searchParams.get('returnUrl')).toBe('/admin/users');
    await browser.screenshot('sign-in');
  });

  it('says the same thing for a wrong password as for an unknown e-mail', async () => {
    const { page } = browser;
    await signIn('operator@clearbase.test', 'not-the-password');
    const wrongPassword = await page.getByTestId('sign-in-error').innerText();
    await signIn('nobody@clearbase.test', 'not-the-password');
    const unknownEmail = await page.getByTestId('sign-in-error').innerText();
    expect(wrongPassword.length).toBeGreaterThan(0);
    expect(unknownEmail).toBe(wrongPassword);
  });

  for (const [role, nav] of Object.entries(expectedNav)) {
    it(`shows the ${role} only the navigation the ${role} role allows`, async () => {
      const { page } = browser;
      await signIn(`${role}@clearbase.test`, demoPassword);
      await page.getByTestId('home-greeting').waitFor();
      const names = await page
        .locator('[data-testid^="nav-"]')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
      for (const name of nav.has) expect(names).toContain(name);
      for (const name of nav.lacks) expect(names).not.toContain(name);
      await browser.screenshot(`home-${role}`);
      if (role === 'admin') {
        await page.getByTestId('nav-users').click();
        await page.locator('[data-testid^="user-row-"]').first().waitFor();
        await browser.screenshot('admin-users');
        await page.getByTestId('nav-audit').click();
        await page.getByTestId('audit-table').waitFor();
        await page.locator('[data-testid^="audit-row-"]').first().waitFor();
        await browser.screenshot('admin-audit');
      }
      await signOut();
    });
  }

  it('loads nothing from any other origin', () => {
    expect(browser.foreignRequests).toEqual([]);
  });
});
