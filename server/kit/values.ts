/**
 * The named values of a record, each null where it is absent (undefined or null): the shape an API
 * answer gives a value that may be missing.
 */
export function valuesOrNull<T extends object, K extends keyof T>(
  source: T,
  keys: readonly K[],
): { [P in K]-?: Exclude<T[P], undefined> | null } {
  return Object.fromEntries(keys.map((key) => [key, source[key] ?? null])) as {
    [P in K]-?: Exclude<T[P], undefined> | null;
  };
}
