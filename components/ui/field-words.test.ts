import { describe, expect, it } from 'vitest';
import { z } from 'zod';

import { fieldWords, typedNumber } from './field-words';

const first = (schema: z.ZodType, v: unknown) => fieldWords(schema.safeParse(v).error!.issues[0]);

describe('form errors in words', () => {
  it('says what to enter instead of what the schema expected', () => {
    expect(first(z.number(), Number.NaN)).toBe('Enter a number');
    expect(first(z.number().min(0), -1)).toBe('Enter 0 or more');
    expect(first(z.number().max(3600), 4000)).toBe('Enter 3600 or less');
    expect(first(z.number().int(), 1.5)).toBe('Enter a whole number');
  });
  it('keeps a message written for people', () => {
    expect(first(z.number().min(1.01, 'A VSWR limit is above 1.00:1'), 1)).toBe('A VSWR limit is above 1.00:1');
  });
  it('reads typed text as a number, empty text as no number, a decimal comma as a point', () => {
    expect(typedNumber('1,5')).toBe(1.5);
    expect(typedNumber('')).toBeNaN();
    expect(typedNumber('abc')).toBeNaN();
  });
});
