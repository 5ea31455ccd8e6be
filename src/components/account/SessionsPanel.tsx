import { useState } from "react";
import type { SessionView } from "../../lib/auth/types";
import { describeBrowser } from "../../lib/auth/user-agent";
import { formatLabelInstant } from "../../lib/format";
import { HydratedControls } from "../forms/island-form";

async function send(url: string, body?: unknown) {
  const response = await fetch(url, {
    method: "DELETE",
    headers: body ? { "content-type": "application/json" } : {},
    body: body ? JSON.stringify(body) : null,
  });
  if (!response.ok) {
    const data = (await response.json().catch(() => ({}))) as { error?: string };
    throw new Error(data.error ?? `The request failed (${response.status}).`);
  }
}

/** The open sessions of My account, each of which can be ended, and "sign out everywhere". */
export default function SessionsPanel({ sessions: initial, timeZone }: { sessions: SessionView[]; timeZone: string }) {
  const [sessions, setSessions] = useState(initial);
  const [problem, setProblem] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const at = (iso: string) => formatLabelInstant(iso, timeZone);
  const others = sessions.filter((s) => !s.current).length;

  async function act(work: () => Promise<void>) {
    setProblem(null);
    setMessage(null);
    try {
      await work();
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    }
  }

  return (
    <HydratedControls>
      <div className="overflow-x-auto">
        <table className="table" aria-label="Open sessions">
          <thead>
            <tr>
              <th>Browser</th>
              <th>Address</th>
              <th>Signed in</th>
              <th>Last used</th>
              <th>Ends by</th>
              <th>
                <span className="sr-only">Action</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {sessions.map((s) => (
              <tr key={s.handle} data-session={s.handle}>
                <td>
                  {describeBrowser(s.userAgent)}
                  {s.current && <span className="tag ml-2">This browser</span>}
                  {s.sharedBench && <span className="tag tag-muted ml-2">Shared bench</span>}
                </td>
                <td className="font-mono">{s.ip ?? "—"}</td>
                <td className="whitespace-nowrap">{at(s.createdAt)}</td>
                <td className="whitespace-nowrap">{at(s.lastSeenAt)}</td>
                <td className="whitespace-nowrap">{at(s.expiresAt)}</td>
                <td>
                  <button
                    type="button"
                    className="btn-quiet btn whitespace-nowrap"
                    onClick={() =>
                      void act(async () => {
                        await send(`/api/account/sessions/${s.handle}`);
                        if (s.current) return window.location.assign("/sign-in");
                        setSessions((list) => list.filter((x) => x.handle !== s.handle));
                        setMessage(`Signed out ${describeBrowser(s.userAgent)} (${s.ip ?? "unknown address"}).`);
                      })
                    }
                  >
                    {s.current ? "Sign out" : "End"}
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {message && (
        <p className="notice mt-3 border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]" role="status">
          {message}
        </p>
      )}
      {problem && (
        <p className="notice notice-danger mt-3" role="alert">
          {problem}
        </p>
      )}
      <div className="mt-4 flex flex-wrap gap-2">
        <button
          type="button"
          className="btn"
          disabled={others === 0}
          onClick={() =>
            void act(async () => {
              await send("/api/account/sessions", { keep: "this" });
              setSessions((list) => list.filter((x) => x.current));
              setMessage("Every other browser has been signed out.");
            })
          }
        >
          Sign out everywhere else
        </button>
        <button
          type="button"
          className="btn-quiet btn"
          onClick={() =>
            void act(async () => {
              await send("/api/account/sessions", { keep: "none" });
              window.location.assign("/sign-in");
            })
          }
        >
          Sign out everywhere, including here
        </button>
      </div>
    </HydratedControls>
  );
}
