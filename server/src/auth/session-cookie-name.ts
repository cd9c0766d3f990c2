/** The session cookie's name. */
export const sessionCookieName = 'clearbase.sid';
