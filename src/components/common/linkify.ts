/** A run of plain text or a link, for showing untrusted text with clickable links and no HTML. */
export type TextSegment = { kind: 'text'; text: string } | { kind: 'link'; href: string; text: string };

// http(s) URLs up to whitespace or an angle bracket; trailing punctuation belongs to the sentence.
const URL_PATTERN = /https?:\/\/[^\s<>"]+/g;
const TRAILING_PUNCTUATION = /[.,;:!?)\]}'"]+$/;

export function linkifyText(text: string): TextSegment[] {
  const segments: TextSegment[] = [];
  let cursor = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    const href = match[0].replace(TRAILING_PUNCTUATION, '');
    if (start > cursor) segments.push({ kind: 'text', text: text.slice(cursor, start) });
    segments.push({ kind: 'link', href, text: href });
    cursor = start + href.length;
  }
  if (cursor < text.length) segments.push({ kind: 'text', text: text.slice(cursor) });
  return segments;
}
