/** A fresh idempotency key for one submit of a form. */
export function newKey(prefix: string): string {
  const random =
    typeof crypto !== "undefined" && "randomUUID" in crypto
      ? crypto.randomUUID()
      : `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 12)}`;
  return `${prefix}-${random}`;
}

/** "YYYY-MM-DDTHH:MM" in UTC, for datetime-local inputs that Decant reads as UTC. */
export function utcInputValue(date = new Date()): string {
  return date.toISOString().slice(0, 16);
}
