/** A return URL is followed only when it stays inside the app: a single leading slash, no scheme, not sign-in. */
export function safeReturnUrl(candidate: string | null | undefined): string {
  if (!candidate || !candidate.startsWith('/') || candidate.startsWith('//') || candidate.startsWith('/\\'))
    return '/';
  if (candidate.startsWith('/sign-in')) return '/';
  return candidate;
}
