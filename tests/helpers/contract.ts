import { expect } from 'vitest';
import type { z } from 'zod';

/**
 * The answer is exactly what its contract in src/contracts says: every field it names, of its
 * type, and no field it does not (parsing drops unknown keys, so the parsed copy would differ).
 */
export function expectContract<S extends z.ZodType>(contract: S, body: unknown): z.infer<S> {
  const parsed = contract.safeParse(body);
  expect(parsed.error?.issues ?? []).toEqual([]);
  expect(parsed.data).toEqual(body);
  return parsed.data as z.infer<S>;
}
