import { afterAll, beforeAll } from 'vitest';
import { openBrowser, type BrowserSession } from './browser-session';
import { demoPassword } from './demo-password';
import { startTestServer, type TestServer } from './test-server';

/** The real server and a Chromium on it, for one test file, with the sign-in page's steps. */
export interface BrowserApp {
  readonly server: TestServer;
  readonly browser: BrowserSession;
  /** The server's address, e.g. `http://127.0.0.1:41234`. */
  readonly url: string;
  /** Fills in and submits the sign-in page, without waiting for what it answers. */
  submitSignIn(email: string, password?: string): Promise<void>;
  /** Signs in through the sign-in page (the demo password unless told) and waits for the home page. */
  signIn(email: string, password?: string): Promise<void>;
  /** Signs out through the user menu and waits for the sign-in page. */
  signOut(): Promise<void>;
}

/**
 * Starts the server and opens the browser before the file's tests (after `prepare`, which makes what the tests
 * upload), and closes both after them.
 *
 * @example
 * const app = useBrowserApp();
 * it('…', async () => { await app.signIn('operator@clearbase.test'); await app.browser.page.getByTestId('nav-orders').click(); });
 */
export function useBrowserApp(options: { prepare?: () => Promise<void> | void } = {}): BrowserApp {
  let server: TestServer | undefined;
  let browser: BrowserSession | undefined;
  beforeAll(async () => {
    await options.prepare?.();
    server = await startTestServer();
    browser = await openBrowser(server.url);
  });
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });
  const started = <T>(value: T | undefined): T => {
    if (value === undefined) throw new Error('The browser app is used before its beforeAll started it.');
    return value;
  };
  const app: BrowserApp = {
    get server() {
      return started(server);
    },
    get browser() {
      return started(browser);
    },
    get url() {
      return started(server).url;
    },
    async submitSignIn(email, password = demoPassword) {
      const { page } = app.browser;
      await page.goto(`${app.url}/sign-in`);
      await page.getByTestId('sign-in-email').fill(email);
      await page.getByTestId('sign-in-password').fill(password);
      await page.getByTestId('sign-in-submit').click();
    },
    async signIn(email, password = demoPassword) {
      await app.submitSignIn(email, password);
      await app.browser.page.getByTestId('home-greeting').waitFor();
    },
    async signOut() {
      const { page } = app.browser;
      await page.getByTestId('user-menu').click();
      await page.getByTestId('sign-out').click();
      await page.getByTestId('sign-in-email').waitFor();
    },
  };
  return app;
}
