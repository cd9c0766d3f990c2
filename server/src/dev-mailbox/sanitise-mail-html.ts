/**
 * Removes what could act from a caught message's HTML before an admin's browser shows it: script, style-less active
 * elements (iframe, object, embed, form, base, meta refresh), event handler attributes and javascript: links. The page
 * also shows it in a sandboxed frame with scripts off, so this is the first of two locks, not the only one.
 *
 * @example
 * sanitiseMailHtml('<p onclick="x()">Hi</p><script>x()</script>'); // '<p>Hi</p>'
 */
export function sanitiseMailHtml(html: string): string {
  return html
    .replace(/<(script|iframe|object|embed|form|template)\b[\s\S]*?<\/\1\s*>/gi, '')
    .replace(/<\/?(script|iframe|object|embed|form|base|link|meta|template)\b[^>]*>/gi, '')
    .replace(/\s+on[a-z]+\s*=\s*("[^"]*"|'[^']*'|[^\s>]+)/gi, '')
    .replace(
      /(href|src|action)\s*=\s*("\s*javascript:[^"]*"|'\s*javascript:[^']*'|javascript:[^\s>]+)/gi,
      '$1="#"',
    );
}
