/**
 * Semantic colours. The resting screen is grey; colour is spent only on abnormal
 * states (ISA-101 high-performance HMI practice). All text pairs pass WCAG AA.
 */
export const palette = {
  background: '#eceeef',
  surface: '#ffffff',
  surfaceMuted: '#f5f6f7',
  border: '#c9cdd1',
  text: '#1d2226',
  textMuted: '#4f575e',
  focus: '#1f5fbf',
  accent: '#2d3a45',
  onAccent: '#ffffff',
  trace: '#59636b',
  traceMuted: '#9aa3ab',
  // abnormal states only
  critical: '#b3141b',
  criticalBg: '#fbe3e4',
  high: '#a84300',
  highBg: '#fdebdc',
  medium: '#7a5a00',
  mediumBg: '#fbf1cf',
  low: '#2c4f8a',
  lowBg: '#e2eaf7',
  silent: '#5b2d8a',
  silentBg: '#efe6f8',
  ok: '#1d5e3a',
} as const;
export type PaletteKey = keyof typeof palette;
