import { describe, expect, it } from 'vitest';
import { sanitiseMailHtml } from './sanitise-mail-html';

describe('sanitiseMailHtml', () => {
  it('removes scripts, frames and forms with their content', () => {
    expect(sanitiseMailHtml('<p>a</p><script>alert(1)</script><iframe src="x"></iframe><form>f</form>')).toBe(
      '<p>a</p>',
    );
  });

  it('removes event handlers and javascript: links but keeps ordinary ones', () => {
    const html = '<a href="javascript:alert(1)" onclick="x()">a</a><a href="https://lab.test/">b</a>';
    expect(sanitiseMailHtml(html)).toBe('<a href="#">a</a><a href="https://lab.test/">b</a>');
  });

  it('removes base and meta elements that could redirect the frame', () => {
    expect(sanitiseMailHtml('<meta http-equiv="refresh" content="0;url=x"><base href="x"><p>ok</p>')).toBe(
      '<p>ok</p>',
    );
  });
});
