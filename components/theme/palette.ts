/**
 * One colour, one meaning. The resting screen is grey; colour is spent only on
 * abnormal states (ISA-101 high-performance HMI practice). All text pairs pass
 * WCAG AA. The table is ordered as a reader meets it: alarm priorities first,
 * then states, then neutral information. DEVELOPERS.md carries the same table.
 *
 * The four priority colours are only ever reached through `priorityColour`, which
 * takes an alarm priority: a form error, a low battery or a danger button cannot
 * borrow "critical red" by accident (palette.test.ts checks the sources for it).
 */
import type { Priority } from '@/telemetry/alarms/machine';

type Entry = { fg: string; bg: string; group: 'priority' | 'state' | 'neutral'; meaning: string };

export const colourTable = {
  // alarm priorities (ISA-18.2): each also carries a sign, so colour is never alone
  critical: { fg: '#b3141b', bg: '#fbe3e4', group: 'priority', meaning: 'An alarm of critical priority (▲▲)' },
  high: { fg: '#a84300', bg: '#fdebdc', group: 'priority', meaning: 'An alarm of high priority (▲)' },
  medium: { fg: '#7a5a00', bg: '#fbf1cf', group: 'priority', meaning: 'An alarm of medium priority (◆)' },
  low: { fg: '#2c4f8a', bg: '#e2eaf7', group: 'priority', meaning: 'An alarm of low priority (●)' },
  // states
  silent: {
    fg: '#5b2d8a',
    bg: '#efe6f8',
    group: 'state',
    meaning: 'A controller not heard from within its reporting window',
  },
  advisory: {
    fg: '#0b5d63',
    bg: '#dcf0f1',
    group: 'state',
    meaning: 'Wants a look soon but raises no alarm: low battery, a stay past its time, a heater drawing little',
  },
  invalid: {
    fg: '#8f1d6b',
    bg: '#f8e3f1',
    group: 'state',
    meaning: 'Something to correct: a field, a refused request, a row that will not import',
  },
  confirmed: { fg: '#1d5e3a', bg: '#e0f0e6', group: 'state', meaning: 'A step done as asked' },
  hazard: {
    fg: '#000000',
    bg: '#ffd21f',
    group: 'state',
    meaning: 'A danger to people (falling ice, RF, gas, mains): safety yellow, after ISO 3864',
  },
  linkLost: {
    fg: '#ffffff',
    bg: '#3b4248',
    group: 'state',
    meaning: "This screen's own link to Thawline is lost: what it shows is old",
  },
  // neutral information: everything at rest, including who is on site
  page: { fg: '#1d2226', bg: '#eceeef', group: 'neutral', meaning: 'Text and the page behind the cards' },
  card: { fg: '#4f575e', bg: '#ffffff', group: 'neutral', meaning: 'Secondary text and a card' },
  quiet: { fg: '#59636b', bg: '#f5f6f7', group: 'neutral', meaning: 'A measured trace and a muted surface' },
  rule: { fg: '#9aa3ab', bg: '#c9cdd1', group: 'neutral', meaning: 'A min–max band and the lines between things' },
  control: { fg: '#1f5fbf', bg: '#2d3a45', group: 'neutral', meaning: 'Keyboard focus, and the main control' },
} as const satisfies Record<string, Entry>;

/** Flat names for the neutral and state colours. Priority colours are not here: use `priorityColour`. */
export const palette = {
  background: colourTable.page.bg,
  surface: colourTable.card.bg,
  surfaceMuted: colourTable.quiet.bg,
  border: colourTable.rule.bg,
  text: colourTable.page.fg,
  textMuted: colourTable.card.fg,
  focus: colourTable.control.fg,
  accent: colourTable.control.bg,
  onAccent: colourTable.card.bg,
  trace: colourTable.quiet.fg,
  traceMuted: colourTable.rule.fg,
  silent: colourTable.silent.fg,
  silentBg: colourTable.silent.bg,
  advisory: colourTable.advisory.fg,
  advisoryBg: colourTable.advisory.bg,
  invalid: colourTable.invalid.fg,
  invalidBg: colourTable.invalid.bg,
  ok: colourTable.confirmed.fg,
  okBg: colourTable.confirmed.bg,
  hazard: colourTable.hazard.fg,
  hazardBg: colourTable.hazard.bg,
  linkLost: colourTable.linkLost.bg,
  onLinkLost: colourTable.linkLost.fg,
} as const;
export type PaletteKey = keyof typeof palette;

/** The colour of an alarm priority, and nothing else. */
export function priorityColour(p: Priority): { fg: string; bg: string } {
  const e = colourTable[p];
  return { fg: e.fg, bg: e.bg };
}

/** What a badge, a tile frame or a map mark can mean: an alarm priority, a state, or nothing abnormal. */
export type Tone = Priority | 'neutral' | 'silent' | 'advisory' | 'invalid' | 'confirmed' | 'hazard';

export function toneColours(tone: Tone): { fg: string; bg: string } {
  switch (tone) {
    case 'neutral':
      return { fg: palette.textMuted, bg: palette.surfaceMuted };
    case 'silent':
      return { fg: palette.silent, bg: palette.silentBg };
    case 'advisory':
      return { fg: palette.advisory, bg: palette.advisoryBg };
    case 'invalid':
      return { fg: palette.invalid, bg: palette.invalidBg };
    case 'confirmed':
      return { fg: palette.ok, bg: palette.okBg };
    case 'hazard':
      return { fg: palette.hazard, bg: palette.hazardBg };
    default:
      return priorityColour(tone);
  }
}
