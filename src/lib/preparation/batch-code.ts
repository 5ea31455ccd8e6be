/**
 * Batch codes: "B" + two-digit year, a dash, month and day of preparation, and from the second
 * batch of a day a running number: B26-1203, B26-1203-2, B26-1203-3. Short enough to read
 * aloud and to print as Code 128 on a 2 × 1 inch label; sorts by date.
 */
export function batchCodeBase(preparedAt: Date): string {
  const iso = preparedAt.toISOString();
  return `B${iso.slice(2, 4)}-${iso.slice(5, 7)}${iso.slice(8, 10)}`;
}

export function nextBatchCode(base: string, taken: readonly string[]): string {
  const used = new Set(taken);
  if (!used.has(base)) return base;
  for (let n = 2; ; n++) if (!used.has(`${base}-${n}`)) return `${base}-${n}`;
}

export const BATCH_CODE_PATTERN = /^B\d{2}-\d{4}(-\d{1,3})?$/;
