import type { z } from 'zod';

/**
 * A form field's error in words a person acts on ("Enter 0 or more"), in place of
 * the schema's own ("Too small: expected number to be >=0", "expected number,
 * received NaN"). Messages a schema wrote for people are kept as they are.
 */
export function fieldWords(issue: z.core.$ZodIssue): string {
  const i = issue as z.core.$ZodIssue & { minimum?: number | bigint; maximum?: number | bigint; expected?: string };
  if (issue.code === 'invalid_type' && i.expected === 'number') return 'Enter a number';
  if (issue.code === 'invalid_type' && i.expected === 'int') return 'Enter a whole number';
  const custom = !/^(Too small|Too big|Invalid input)/.test(issue.message);
  if (custom) return issue.message;
  if (issue.code === 'too_small' && i.minimum != null) return `Enter ${String(i.minimum)} or more`;
  if (issue.code === 'too_big' && i.maximum != null) return `Enter ${String(i.maximum)} or less`;
  return issue.message;
}

/** Text typed into a number field, as a number; NaN (never 0) when it is empty or not a number. */
export const typedNumber = (text: string) => (text.trim() === '' ? Number.NaN : Number(text.replace(',', '.')));
