/**
 * Just enough of RFC 5322 / RFC 2045 to read the mails Meander sends: unfolded headers, a
 * single-part or multipart body, the text/plain part decoded from quoted-printable or base64,
 * and RFC 2047 encoded words in the subject.
 */
export interface ParsedMail {
  subject: string;
  to: string[];
  from: string;
  text: string;
}

export function parseMail(raw: string): ParsedMail {
  const { headers, body } = splitHeaders(raw);
  const text = readTextPart(headers, body);
  return {
    subject: decodeEncodedWords(headers.get('subject') ?? ''),
    to: (headers.get('to') ?? '')
      .split(',')
      .map((address) => address.trim())
      .filter(Boolean),
    from: headers.get('from') ?? '',
    text,
  };
}

function splitHeaders(raw: string): { headers: Map<string, string>; body: string } {
  const normalised = raw.replace(/\r\n/g, '\n');
  const blank = normalised.indexOf('\n\n');
  const head = blank === -1 ? normalised : normalised.slice(0, blank);
  const body = blank === -1 ? '' : normalised.slice(blank + 2);
  const headers = new Map<string, string>();
  // Folded header lines continue with whitespace (RFC 5322 §2.2.3).
  for (const line of head.replace(/\n[ \t]+/g, ' ').split('\n')) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function readTextPart(headers: Map<string, string>, body: string): string {
  const contentType = headers.get('content-type') ?? 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(contentType)?.[1];
  if (contentType.toLowerCase().startsWith('multipart/') && boundary) {
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) {
      if (part.startsWith('--')) break;
      const parsed = splitHeaders(part.replace(/^\n/, ''));
      if ((parsed.headers.get('content-type') ?? 'text/plain').toLowerCase().startsWith('text/plain')) {
        return readTextPart(parsed.headers, parsed.body);
      }
    }
    return '';
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  const decoded =
    encoding === 'quoted-printable'
      ? decodeQuotedPrintable(body)
      : encoding === 'base64'
        ? Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8')
        : body;
  return decoded.replace(/\n$/, '');
}

/** RFC 2045 §6.7: soft line breaks end in "=", other "=XX" are bytes. */
export function decodeQuotedPrintable(body: string): string {
  const bytes = body.replace(/=\n/g, '').replace(/=([0-9A-Fa-f]{2})/g, (_match, hex: string) => `%${hex}`);
  try {
    return decodeURIComponent(bytes.replace(/%(?![0-9A-Fa-f]{2})/g, '%25'));
  } catch {
    return bytes;
  }
}

/** RFC 2047: =?charset?B|Q?text?= (UTF-8 and ASCII are all Meander sends). */
function decodeEncodedWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?[^?]+\?([BbQq])\?([^?]*)\?=/g, (_match, kind: string, text: string) =>
      kind.toUpperCase() === 'B'
        ? Buffer.from(text, 'base64').toString('utf8')
        : decodeQuotedPrintable(text.replace(/_/g, ' ')),
    );
}
