/**
 * Meander's colours. One accent (a deep river teal), a quiet sand page, warm paper cards and ink
 * text. The same values are CSS custom properties in base.css (`--meander-*`), for plain CSS in
 * components; the edge colours of cell cards are named there too (shared/cells/colours.ts).
 */
export const palette = {
  accent: '#1d6a64',
  accentHover: '#26837b',
  accentPressed: '#14504b',
  accentSoft: '#dcebe7',
  sand: '#f3ede2',
  sandDeep: '#e9e0d0',
  paper: '#fffcf6',
  ink: '#1e2629',
  inkSoft: '#4c585c',
  inkFaint: '#5a6366', // 4.5:1 or more on paper, sand and sand-deep (WCAG AA text)
  rule: '#dcd2c0',
  error: '#a63a2c',
  warning: '#9a6512',
  success: '#3b7438',
  info: '#2c5f86',
} as const;
