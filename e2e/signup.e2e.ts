import { describe, expect, it } from 'vitest';
import { apiAs } from './support/api-as';
import { useBrowserApp } from './support/browser-app';
import { caughtMailTo } from './support/caught-mail-to';
import { demoPassword } from './support/demo-password';

const app = useBrowserApp();

describe('signing up', () => {
  it('signs up, confirms the address from the caught mail and signs in as a customer', async () => {
    const { page } = app.browser;
    await page.goto(`${app.url}/sign-in`);
    await page.getByTestId('sign-in-create-account').click();
    await page.getByTestId('sign-up-name').fill('Wren Hollis');
    await page.getByTestId('sign-up-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-up-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('sign-up-sent').waitFor();
    await app.browser.screenshot('sign-up-sent');

    // no account before the address is confirmed
    await app.submitSignIn('wren.hollis@example.test', 'tidewater-and-kiln');
    await page.getByTestId('sign-in-error').waitFor();

    const mail = await caughtMailTo(app.url, 'wren.hollis@example.test');
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
    await app.browser.screenshot('sign-up-verified');
    await page.getByTestId('verify-sign-in').click();

    await page.getByTestId('sign-in-email').fill('wren.hollis@example.test');
    await page.getByTestId('sign-in-password').fill('tidewater-and-kiln');
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('nav-prices').waitFor();
    expect(new URL(page.url()).pathname).toBe('/');
    expect(await page.getByTestId('nav-dev-mailbox').count()).toBe(0);
    expect(app.browser.foreignRequests).toEqual([]);
  });
});

describe('paying for an order', () => {
  it('pays a two-roll order on the payment fake’s page; the signed event marks it paid and a receipt is mailed', async () => {
    const customer = await apiAs(app.url, 'customer@clearbase.test', demoPassword);
    const { stocks } = (await (await customer.get('/api/stocks')).json()) as {
      stocks: { id: number; frameFormats: string[]; process: string }[];
    };
    const stock = stocks.find((s) => s.frameFormats.includes('135-36') && s.process === 'C-41')!;
    const order = (await (await customer.post('/api/orders', { scanSize: 'standard' })).json()) as {
      id: number;
    };
    for (const pushPull of [0, 1]) {
      const roll = await customer.post(`/api/orders/${order.id}/rolls`, {
        stockId: stock.id,
        ei: 400,
        format: '135-36',
        pushPull,
      });
      expect(roll.status).toBe(201);
    }
    const checkout = await customer.post(`/api/orders/${order.id}/checkout`);
    expect(checkout.status).toBe(201);
    const { checkoutUrl, payment } = (await checkout.json()) as {
      checkoutUrl: string;
      payment: { amountMinor: number; currency: string };
    };
    // starter price list: 12.00 developing and 8.00 scanning a roll, 3.00 a stop pushed
    expect(payment).toMatchObject({ amountMinor: 4300, currency: 'EUR' });

    const { page } = app.browser;
    await page.goto(checkoutUrl);
    expect(await page.locator('h1').innerText()).toBe('Pay 43.00 EUR');
    await app.browser.screenshot('payment-fake-checkout');
    await page.getByTestId('fake-approve').click();
    await page.waitForURL((url) => url.origin === app.url);
    expect(new URL(page.url()).searchParams.get('payment')).toBe('done');

    const payments = (await (await customer.get(`/api/orders/${order.id}/payments`)).json()) as {
      payments: { status: string }[];
    };
    expect(payments.payments.map((p) => p.status)).toEqual(['paid']);
    const receipt = await caughtMailTo(app.url, 'customer@clearbase.test', /^Payment received/);
    expect(receipt.text).toContain(`€43.00 for order ${order.id}`);
  });
});
