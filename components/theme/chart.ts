import { palette } from './palette';
import { font } from './tokens';

/** The axes of every chart: muted 14 px tick labels, the border colour for axis and grid. */
export const chartAxis = {
  tickLabels: { fontFamily: font.regular, fontSize: 14, fill: palette.textMuted },
  axis: { stroke: palette.border },
  grid: { stroke: palette.surfaceMuted },
};
