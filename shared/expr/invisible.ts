/**
 * Characters that change how text reads without showing: format characters (zero-width joiners,
 * bidi controls, the byte-order mark, the soft hyphen) and every default-ignorable code point
 * (the combining grapheme joiner, variation selectors, Hangul fillers). In an expression or a
 * name they could make two different texts look the same, so both are refused.
 */
const INVISIBLE = /[\p{Cf}\p{Default_Ignorable_Code_Point}]/u;

/** The first invisible character of the text, with its offset (in UTF-16 units), or null. */
export function firstInvisibleCharacter(
  text: string,
): { at: number; length: number; codePoint: string } | null {
  const match = INVISIBLE.exec(text);
  if (!match) return null;
  const code = match[0].codePointAt(0) ?? 0;
  return {
    at: match.index,
    length: match[0].length,
    codePoint: `U+${code.toString(16).toUpperCase().padStart(4, '0')}`,
  };
}
