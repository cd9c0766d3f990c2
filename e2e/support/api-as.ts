/** A signed-in user talking to the API with fetch. */
export interface Api {
  get(path: string): Promise<Response>;
  post(path: string, body?: object): Promise<Response>;
  postForm(path: string, form: FormData): Promise<Response>;
}

/**
 * Signs in to the server at `appUrl` through the API, keeping the cookies and sending the CSRF header by hand, as a
 * second user beside the browser's.
 *
 * @example
 * const admin = await apiAs(app.url, 'admin@clearbase.test', demoPassword);
 * const list = await (await admin.get('/api/dev/mailbox')).json();
 */
export async function apiAs(appUrl: string, email: string, password: string): Promise<Api> {
  const cookies = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      cookies.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
    return res;
  };
  const headers = (json: boolean): Record<string, string> => ({
    ...(json ? { 'content-type': 'application/json' } : {}),
    cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join('; '),
    'x-xsrf-token': decodeURIComponent(cookies.get('XSRF-TOKEN') ?? ''),
  });
  const api: Api = {
    get: async (path) => keep(await fetch(`${appUrl}${path}`, { headers: headers(false) })),
    post: async (path, body = {}) =>
      keep(
        await fetch(`${appUrl}${path}`, {
          method: 'POST',
          headers: headers(true),
          body: JSON.stringify(body),
        }),
      ),
    postForm: async (path, form) =>
      keep(await fetch(`${appUrl}${path}`, { method: 'POST', headers: headers(false), body: form })),
  };
  await api.get('/api/health');
  const login = await api.post('/api/auth/login', { email, password });
  if (login.status !== 200)
    throw new Error(`Signing in as ${email} answered ${login.status}: ${await login.text()}`);
  return api;
}
