import { describe, expect, it } from 'vitest';
import { renderNote } from '@/components/cells/noteMarkdown';

describe('renderNote', () => {
  it('renders headings, emphasis and lists', () => {
    const html = renderNote('# Stock\n\nA *harvested* stock:\n\n- growth\n- catch');
    expect(html).toContain('<h1>Stock</h1>');
    expect(html).toContain('<em>harvested</em>');
    expect(html).toContain('<li>growth</li>');
  });

  it('never lets an image with an onerror handler through as markup', () => {
    const html = renderNote('before <img src=x onerror=alert(1)> after');
    const host = document.createElement('div');
    host.innerHTML = html;
    expect(host.querySelector('img')).toBeNull();
    expect(host.querySelector('[onerror]')).toBeNull();
    // The raw HTML is shown as text, so nothing typed is lost either.
    expect(host.textContent).toContain('<img src=x onerror=alert(1)>');
  });

  it('never lets a script element through', () => {
    const html = renderNote('<script>alert(1)</script>\n\ntext');
    const host = document.createElement('div');
    host.innerHTML = html;
    expect(host.querySelector('script')).toBeNull();
    expect(html).not.toMatch(/<script/i);
  });

  it('drops javascript: links', () => {
    const host = document.createElement('div');
    host.innerHTML = renderNote('[click](javascript:alert(1))');
    const link = host.querySelector('a');
    expect(link?.getAttribute('href') ?? '').not.toMatch(/^javascript:/i);
  });
});
