/** How many options a searchable choice shows before asking for a few letters. */
export const shownAtOnce = 8;

/** Lower-case and without accents, so "oxlow" finds "Oxlöw" and "sbf" finds "(SBF)". */
const fold = (s: string) =>
  s
    .normalize('NFD')
    .replace(/\p{Diacritic}/gu, '')
    .toLowerCase();

/**
 * The options a searchable choice shows: those whose label holds every word typed
 * (in any order), at most `max`, and always the one chosen so it never vanishes.
 */
export function pickOptions<T>(
  options: { value: T; label: string }[],
  query: string,
  value: T | null,
  max = shownAtOnce,
): { shown: { value: T; label: string }[]; matching: number } {
  const words = fold(query).split(/\s+/).filter(Boolean);
  const matches = options.filter((o) => words.every((w) => fold(o.label).includes(w)));
  const shown = matches.slice(0, max);
  const chosen = options.find((o) => o.value === value);
  if (chosen && !shown.includes(chosen)) shown.unshift(chosen);
  return { shown, matching: matches.length };
}
