/** Where each step of a sign-in continues; a finished sign-in goes where the person was headed. */
export const STEP_PAGES = {
  "second-factor": "/sign-in/code",
  "two-factor-setup": "/sign-in/two-factor-setup",
} as const;

export type PendingStage = keyof typeof STEP_PAGES;

/** Only local paths, so a `next` in a link cannot send anyone to another site. */
export function safeNext(requested: string | null | undefined, fallback = "/home"): string {
  return requested && requested.startsWith("/") && !requested.startsWith("//") && !requested.startsWith("/\\") ? requested : fallback;
}
