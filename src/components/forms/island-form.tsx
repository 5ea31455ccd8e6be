import { useEffect, useState, type FormHTMLAttributes, type ReactNode } from "react";

/**
 * Controls that stay disabled until React has hydrated the island they are in. Astro hydrates
 * React islands in a transition, after the server-rendered HTML is already on screen: a value
 * typed, picked or chosen in that moment would reach the page but not React, and be lost. The
 * fieldset has `display: contents`, so the surrounding grid or flex layout still applies.
 */
export function HydratedControls({ children }: { children: ReactNode }) {
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return (
    <fieldset disabled={!hydrated} className="contents">
      {children}
    </fieldset>
  );
}

/** A form whose controls take input only once React has hydrated it (`HydratedControls`). */
export function IslandForm({ children, ...form }: FormHTMLAttributes<HTMLFormElement>) {
  return (
    <form {...form}>
      <HydratedControls>{children}</HydratedControls>
    </form>
  );
}
