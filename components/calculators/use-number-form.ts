import { useMemo, useState } from 'react';
import { z } from 'zod';

export type FieldSpec = {
  label: string;
  unit?: string;
  initial: string;
  min?: number;
  max?: number;
  positive?: boolean;
};

/** Text inputs parsed as numbers with zod; results only when every field is valid. */
export function useNumberForm<K extends string>(fields: Record<K, FieldSpec>) {
  const [values, setValues] = useState<Record<K, string>>(
    () =>
      Object.fromEntries(Object.entries(fields).map(([k, f]) => [k, (f as FieldSpec).initial])) as Record<K, string>,
  );
  const schema = useMemo(() => {
    const shape: Record<string, z.ZodType<number>> = {};
    for (const [k, f] of Object.entries(fields) as [K, FieldSpec][]) {
      let n = z.coerce.number({ message: 'Enter a number' }).refine(Number.isFinite, 'Enter a number');
      if (f.positive) n = n.refine((v) => v > 0, 'Must be above 0');
      if (f.min != null) n = n.refine((v) => v >= f.min!, `At least ${f.min}`);
      if (f.max != null) n = n.refine((v) => v <= f.max!, `At most ${f.max}`);
      shape[k] = z.preprocess(
        (v) => (typeof v === 'string' && v.trim() === '' ? undefined : typeof v === 'string' ? v.replace(',', '.') : v),
        n,
      );
    }
    return z.object(shape);
  }, [fields]);
  const parsed = schema.safeParse(values);
  const errors: Partial<Record<K, string>> = {};
  if (!parsed.success)
    for (const i of parsed.error.issues)
      errors[i.path[0] as K] ??=
        i.message === 'Invalid input: expected number, received undefined' ? 'Required' : i.message;
  return {
    values,
    set: (k: K) => (v: string) => setValues((old) => ({ ...old, [k]: v })),
    errors,
    data: parsed.success ? (parsed.data as Record<K, number>) : null,
  };
}
