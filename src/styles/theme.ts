import type { GlobalThemeOverrides } from 'naive-ui';
import { palette } from './palette';

/** naive-ui theme overrides: Meander's fonts (bundled by @fontsource) and colours. */
export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily: "'Source Sans 3', system-ui, sans-serif",
    fontFamilyMono: "'JetBrains Mono', ui-monospace, monospace",
    fontSize: '15px',
    fontSizeMedium: '15px',
    fontWeightStrong: '600',
    primaryColor: palette.accent,
    primaryColorHover: palette.accentHover,
    primaryColorPressed: palette.accentPressed,
    primaryColorSuppl: palette.accentHover,
    infoColor: palette.info,
    successColor: palette.success,
    warningColor: palette.warning,
    errorColor: palette.error,
    textColorBase: palette.ink,
    textColor1: palette.ink,
    textColor2: palette.ink,
    textColor3: palette.inkSoft,
    bodyColor: palette.sand,
    cardColor: palette.paper,
    modalColor: palette.paper,
    popoverColor: palette.paper,
    tableColor: palette.paper,
    borderColor: palette.rule,
    dividerColor: palette.rule,
    borderRadius: '6px',
    borderRadiusSmall: '4px',
  },
  Card: { borderRadius: '8px', titleFontWeight: '600' },
  DataTable: { thColor: palette.sandDeep, tdColor: palette.paper, thFontWeight: '600' },
  Button: { fontWeight: '600' },
};
