/** How a name typesets in TeX: Greek letters as letters, trailing digits and `_` as subscripts. */

const GREEK_LETTERS: Readonly<Record<string, string>> = {
  α: '\\alpha',
  β: '\\beta',
  γ: '\\gamma',
  δ: '\\delta',
  ε: '\\varepsilon',
  ϵ: '\\epsilon',
  ζ: '\\zeta',
  η: '\\eta',
  θ: '\\theta',
  ϑ: '\\vartheta',
  ι: '\\iota',
  κ: '\\kappa',
  λ: '\\lambda',
  μ: '\\mu',
  ν: '\\nu',
  ξ: '\\xi',
  ο: 'o',
  π: '\\pi',
  ϖ: '\\varpi',
  ρ: '\\rho',
  ϱ: '\\varrho',
  σ: '\\sigma',
  ς: '\\varsigma',
  τ: '\\tau',
  υ: '\\upsilon',
  φ: '\\varphi',
  ϕ: '\\phi',
  χ: '\\chi',
  ψ: '\\psi',
  ω: '\\omega',
  Α: 'A',
  Β: 'B',
  Γ: '\\Gamma',
  Δ: '\\Delta',
  Ε: 'E',
  Ζ: 'Z',
  Η: 'H',
  Θ: '\\Theta',
  Ι: 'I',
  Κ: 'K',
  Λ: '\\Lambda',
  Μ: 'M',
  Ν: 'N',
  Ξ: '\\Xi',
  Ο: 'O',
  Π: '\\Pi',
  Ρ: 'P',
  Σ: '\\Sigma',
  Τ: 'T',
  Υ: '\\Upsilon',
  Φ: '\\Phi',
  Χ: 'X',
  Ψ: '\\Psi',
  Ω: '\\Omega',
};

/** Greek letters spelled in Latin letters, as modellers often name parameters (`sigma`). */
const GREEK_WORDS = new Set([
  'alpha',
  'beta',
  'gamma',
  'delta',
  'epsilon',
  'zeta',
  'eta',
  'theta',
  'iota',
  'kappa',
  'lambda',
  'mu',
  'nu',
  'xi',
  'rho',
  'sigma',
  'tau',
  'upsilon',
  'phi',
  'chi',
  'psi',
  'omega',
  'Gamma',
  'Delta',
  'Theta',
  'Lambda',
  'Xi',
  'Pi',
  'Sigma',
  'Upsilon',
  'Phi',
  'Psi',
  'Omega',
]);

/**
 * A name in TeX. Names are letters, digits and "_" (symbolNameSchema); anything else is shown as
 * "?", so no TeX command or special character can come from a name.
 */
export function symbolTex(name: string): string {
  const safe = name.replace(/[^\p{L}0-9_]/gu, '?');
  if (safe.startsWith('_') || safe === '') return `\\mathrm{${escapeUnderscores(safe)}}`;
  const underscore = safe.indexOf('_');
  if (underscore > 0) {
    const subscript = safe.slice(underscore + 1);
    const written = subscript.includes('_')
      ? `\\mathrm{${escapeUnderscores(subscript)}}`
      : wordTex(subscript);
    return `${wordTex(safe.slice(0, underscore))}_{${written}}`;
  }
  const digits = /^(.*?[^0-9])([0-9]+)$/u.exec(safe);
  if (digits) return `${wordTex(digits[1]!)}_{${digits[2]}}`;
  return wordTex(safe);
}

function wordTex(word: string): string {
  if (word === '') return '';
  const greek = GREEK_LETTERS[word] ?? (GREEK_WORDS.has(word) ? `\\${word}` : undefined);
  if (greek) return greek;
  if (/^[0-9]+$/.test(word)) return word;
  const ascii = /^[A-Za-z0-9?]+$/.test(word);
  if (ascii) return [...word].length === 1 ? word : `\\mathrm{${word}}`;
  return `\\text{${word}}`;
}

function escapeUnderscores(text: string): string {
  return text.replace(/_/g, '\\_');
}
