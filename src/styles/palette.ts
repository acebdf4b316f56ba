/**
 * Meander's colours. One accent (a deep river teal), a quiet sand page, warm paper cards and ink
 * text. Cell kinds get their own edge colours so a sheet reads at a glance. The same values are
 * CSS custom properties in base.css (`--meander-*`), for plain CSS in components.
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
  inkFaint: '#7a8386',
  rule: '#dcd2c0',
  error: '#a63a2c',
  warning: '#9a6512',
  success: '#3b7438',
  info: '#2c5f86',
} as const;

/** Edge colour of a cell card, by cell kind. */
export const cellKindColours = {
  note: '#9c8b6c',
  params: '#b07d22',
  model: '#1d6a64',
  simulation: '#2c5f86',
  chart: '#5a7d36',
  probe: '#7c4b72',
  study: '#56656e',
} as const;
