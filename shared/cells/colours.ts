/**
 * The named edge colours of cell cards (CSS custom properties `--meander-edge-<name>` in
 * src/styles/base.css). A new kind picks one; spare ones wait for the kinds to come.
 */
export const EDGE_COLOURS = [
  'sand',
  'ochre',
  'teal',
  'blue',
  'moss',
  'plum',
  'slate',
  'rust',
  'olive',
  'indigo',
  'clay',
] as const;

export type EdgeColour = (typeof EDGE_COLOURS)[number];
