/** Spacing, type scale and radii: every size in a screen comes from here. */
export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32 } as const;
export const radius = { sm: 4, md: 8, lg: 12 } as const;
export const font = {
  regular: 'Inter_400Regular',
  semibold: 'Inter_600SemiBold',
} as const;
/** No text below 14 px on a phone. */
export const type = {
  small: { fontSize: 14, lineHeight: 20 },
  body: { fontSize: 16, lineHeight: 24 },
  title: { fontSize: 20, lineHeight: 28 },
  heading: { fontSize: 26, lineHeight: 34 },
  figure: { fontSize: 32, lineHeight: 38 },
  wallFigure: { fontSize: 44, lineHeight: 50 },
  /** 4K wall screens, read from across a room */
  wallTitleXL: { fontSize: 34, lineHeight: 42 },
  wallFigureXL: { fontSize: 76, lineHeight: 84 },
  wallSmallXL: { fontSize: 22, lineHeight: 30 },
} as const;
export const size = {
  touch: 44,
  maxContent: 1200,
  /** a form field or button on a wide screen is no wider than this */
  formMax: 560,
  tileMin: 260,
  wallTileMin: 340,
  sparkHeight: 36,
  chartHeight: 260,
  borderWidth: 1,
  focusWidth: 3,
} as const;

/** The chart's plot margins; bands beneath it use the same so that times line up. */
export const chartPad = { top: 12, bottom: 36, left: 52, right: 16 } as const;
