/** "YYYY-MM-DDTHH:MM" in UTC, for datetime-local inputs that Decant reads as UTC. */
export function utcInputValue(date = new Date()): string {
  return date.toISOString().slice(0, 16);
}
