import type { Page } from 'playwright-core';

/** What a call from the page answered: its status, its content type and its JSON body (null when empty). */
export interface PageAnswer {
  status: number;
  type: string | null;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- the answers of several routes, read field by field
  body: any;
}

/**
 * A JSON call made by the signed-in page itself, with its session's cookies and CSRF token.
 *
 * @example
 * const order = await fetchFromPage(page, 'POST', '/api/orders', { outputFormats: ['jpeg'] });
 */
export function fetchFromPage(page: Page, method: string, path: string, body?: unknown): Promise<PageAnswer> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]*)/.exec(document.cookie)?.[1] ?? '');
      const res = await fetch(path, {
        method,
        headers: { 'content-type': 'application/json', 'x-xsrf-token': token },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
      });
      const text = await res.text();
      return {
        status: res.status,
        type: res.headers.get('content-type'),
        body: text ? JSON.parse(text) : null,
      };
    },
    { method, path, body },
  );
}
