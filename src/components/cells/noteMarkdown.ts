import MarkdownIt from 'markdown-it';
import DOMPurify from 'dompurify';

/** Raw HTML in a note is shown as text, never interpreted: a shared sheet is someone else's text. */
const markdown = new MarkdownIt({ html: false, linkify: true, typographer: true });

/**
 * Markdown of a note as sanitised HTML. markdown-it with html:false already escapes tags; DOMPurify
 * is the second fence (links with javascript: URLs, anything a plugin might let through).
 */
export function renderNote(text: string): string {
  const html = markdown.render(text);
  return DOMPurify.sanitize(html, { USE_PROFILES: { html: true } });
}
