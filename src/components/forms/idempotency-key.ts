/** A fresh idempotency key for one submit of a form (`fields.idempotencyKey`: 8–80 of A–Z a–z 0–9 _ : -). */
export function newKey(prefix: string): string {
  const random =
    typeof crypto !== "undefined" && "randomUUID" in crypto
      ? crypto.randomUUID()
      : `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 12)}`;
  return `${prefix}-${random}`;
}
