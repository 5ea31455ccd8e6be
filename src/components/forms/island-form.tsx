import { useEffect, useState, type FormHTMLAttributes } from "react";

/**
 * A form whose controls stay disabled until React has hydrated it. Astro hydrates React islands in a
 * transition, after the server-rendered form is already on screen: a value typed or picked in that
 * moment would reach the page but not react-hook-form, and be lost. The fieldset has
 * `display: contents`, so the form's own grid or flex layout still applies to its children.
 */
export function IslandForm({ children, ...form }: FormHTMLAttributes<HTMLFormElement>) {
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return (
    <form {...form}>
      <fieldset disabled={!hydrated} className="contents">
        {children}
      </fieldset>
    </form>
  );
}
