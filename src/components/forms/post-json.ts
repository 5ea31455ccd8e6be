// Kept apart from form.tsx so that islands which only post (buttons, hand-made forms) do not
// load react-hook-form with it.

/** Posts JSON to an API route; throws with the route's message on failure. */
export async function postJson<T = unknown>(url: string, body: unknown, method = "POST"): Promise<T> {
  const response = await fetch(url, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  if (response.status === 204) return undefined as T;
  const data = (await response.json().catch(() => ({}))) as { error?: string };
  if (!response.ok) throw new Error(data.error ?? `The request failed (${response.status}).`);
  return data as T;
}
