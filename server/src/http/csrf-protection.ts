import { xsrfCookieName, xsrfHeaderName } from '@clearbase/contracts';
import type { RequestHandler } from 'express';
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { AppError } from '../errors/app-error';

export const csrfCookieName = xsrfCookieName;
export const csrfHeaderName = xsrfHeaderName;

// RFC 9110 §9.2.1: only these methods are safe; every other one changes state and must carry the token
const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

function sign(nonce: string, secret: string): string {
  return createHmac('sha256', secret).update(`csrf:${nonce}`).digest('base64url');
}

/** Issues a token "nonce.signature"; the signature is HMAC-SHA256 of the nonce under SESSION_SECRET. */
export function issueCsrfToken(secret: string): string {
  // 18 random bytes (144 bits): above the 128 bits OWASP's CSRF cheat sheet asks of tokens
  const nonce = randomBytes(18).toString('base64url');
  return `${nonce}.${sign(nonce, secret)}`;
}

export function isValidCsrfToken(token: string | undefined, secret: string): boolean {
  if (!token) return false;
  const [nonce, signature, extra] = token.split('.');
  if (!nonce || !signature || extra !== undefined) return false;
  const expected = Buffer.from(sign(nonce, secret));
  const actual = Buffer.from(signature);
  return expected.length === actual.length && timingSafeEqual(expected, actual);
}

function readCookie(header: string | undefined, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return decodeURIComponent(part.slice(eq + 1).trim());
  }
  return undefined;
}

function equalStrings(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * Signed double-submit cookie. Every response whose request lacks a valid token sets a fresh `XSRF-TOKEN` cookie
 * (readable by scripts, SameSite=Lax); every request of an unsafe method (anything but GET, HEAD and OPTIONS), on any
 * path and in any letter case, must send the same value in `X-XSRF-TOKEN`. Another site can neither read the cookie nor forge the signature, so it cannot send a matching pair.
 * The token is not tied to the session, which keeps sign-in working from the first anonymous GET; SameSite=Lax on the
 * session cookie is the second line.
 */
export function csrfProtection(options: {
  secret: string;
  secure: boolean;
  /** Paths whose callers prove themselves otherwise (a signed payment event), checked exactly. */
  exemptPaths?: readonly string[];
}): RequestHandler {
  return (req, res, next) => {
    const cookie = readCookie(req.headers.cookie, csrfCookieName);
    const cookieValid = isValidCsrfToken(cookie, options.secret);
    if (!cookieValid) {
      res.cookie(csrfCookieName, issueCsrfToken(options.secret), {
        httpOnly: false,
        sameSite: 'lax',
        secure: options.secure,
        path: '/',
      });
    }
    if (safeMethods.has(req.method)) return next();
    // exact and case-sensitive, as routing is: /API/payments/webhook reaches no route and is not exempt
    if (options.exemptPaths?.includes(req.path)) return next();
    const header = req.get(csrfHeaderName);
    if (!cookieValid || !header || !equalStrings(header, cookie!)) {
      return next(
        new AppError(
          'csrf-token-invalid',
          403,
          'The request lacks a valid X-XSRF-TOKEN header matching the XSRF-TOKEN cookie. Reload the page and try again.',
        ),
      );
    }
    next();
  };
}
