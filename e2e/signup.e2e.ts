import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, type BrowserSession } from './support/browser-session';
import { startTestServer, type TestServer } from './support/test-server';

const demoPassword = 'clearbase-demo';

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

/** A signed-in admin talking to the API with fetch: cookies and the CSRF header kept by hand. */
async function adminApi(): Promise<(path: string) => Promise<Response>> {
  const cookies = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      cookies.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
  };
  const cookieHeader = () => [...cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  keep(await fetch(`${server.url}/api/health`));
  const login = await fetch(`${server.url}/api/auth/login`, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      cookie: cookieHeader(),
      'x-xsrf-token': decodeURIComponent(cookies.get('XSRF-TOKEN') ?? ''),
    },
    body: JSON.stringify({ email: 'admin@clearbase.test', password: demoPassword }),
  });
  expect(login.status).toBe(200);
  keep(login);
  return (path) => fetch(`${server.url}${path}`, { headers: { cookie: cookieHeader() } });
}

/** Waits for the outbox to hand a message for this address to the local mail catcher. */
async function caughtMailTo(
  address: string,
): Promise<{ subject: string; text: string; html: string | null }> {
  const get = await adminApi();
  const deadline = Date.now() + 30_000;
  for (;;) {
    const list = (await (await get('/api/dev/mailbox')).json()) as {
      messages: { id: string; to: string[] }[];
    };
    const found = list.messages.find((m) => m.to.includes(address));
    if (found) return (await (await get(`/api/dev/mailbox/${found.id}`)).json()) as never;
    if (Date.now() > deadline) throw new Error(`no mail to ${address} was caught within 30 s`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

describe('signing up', () => {
  it('signs up, confirms the address from the caught mail and signs in as a customer', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('sign-in-create-account').click();
    await page.getByTestId('sign-up-name').fill('Wren Hollis');
    await page.getByTestId('sign-up-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-up-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('sign-up-sent').waitFor();
    await browser.screenshot('sign-up-sent');

    // no account before the address is confirmed
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('sign-in-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-in-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('sign-in-error').waitFor();

    const mail = await caughtMailTo('wren.hollis@example.test');
    expect(mail.subject).toBe('Confirm your e-mail address for Clearbase demo lab');
    expect(mail.text).toContain('Hello Wren Hollis,');
    expect(mail.text).toContain('14 Kiln Row, Wrenmouth');
    expect(mail.html).toContain('Confirm my e-mail address');
    const link = /http:\/\/127\.0\.0\.1:\d+\/verify-email\?token=[A-Za-z0-9_-]+/.exec(mail.text)?.[0];
    expect(link, mail.text).toBeDefined();

    await page.goto(link!);
    await page.getByTestId('verify-done').waitFor();
    expect(await page.getByTestId('verify-done').innerText()).toContain(
      'wren.hollis@example.test is confirmed',
    );
    await browser.screenshot('sign-up-verified');
    await page.getByTestId('verify-sign-in').click();

    await page.getByTestId('sign-in-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-in-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('nav-prices').waitFor();
    expect(new URL(page.url()).pathname).toBe('/');
    expect(await page.getByTestId('nav-dev-mailbox').count()).toBe(0);
    expect(browser.foreignRequests).toEqual([]);
  });
});
