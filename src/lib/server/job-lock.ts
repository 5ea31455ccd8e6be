// A lease in the job_locks table, so that scheduled work (alert mails, digests) runs on one app
// instance at a time however many run behind the proxy. The lease expires by itself, so a
// crashed instance never blocks the job for longer than the lease.
import { randomBytes } from "node:crypto";
import { hostname } from "node:os";
import { execute, selectOne } from "./query";

export interface JobLease {
  name: string;
  holder: string;
}

/** Takes the lease named `name` for `ttl_ms`, or answers null when another holder has it. */
export async function acquireJobLock(name: string, ttl_ms: number): Promise<JobLease | null> {
  const holder = `${hostname()}:${process.pid}:${randomBytes(4).toString("hex")}`;
  const expiresAt = new Date(Date.now() + ttl_ms);
  // One statement, so two instances racing for an expired lease serialise on the row lock.
  // In ON DUPLICATE KEY UPDATE the assignments run left to right: the second IF still sees the
  // old expires_at, because it is assigned after holder.
  await execute(
    `INSERT INTO job_locks (name, holder, expires_at) VALUES (:name, :holder, :expiresAt)
     ON DUPLICATE KEY UPDATE
       holder = IF(expires_at < NOW(3), VALUES(holder), holder),
       expires_at = IF(holder = VALUES(holder), VALUES(expires_at), expires_at)`,
    { replacements: { name, holder, expiresAt } },
  );
  const row = await selectOne<{ holder: string }>("SELECT holder FROM job_locks WHERE name = :name", { replacements: { name } });
  return row?.holder === holder ? { name, holder } : null;
}

export async function releaseJobLock(lease: JobLease): Promise<void> {
  await execute("DELETE FROM job_locks WHERE name = :name AND holder = :holder", {
    replacements: { name: lease.name, holder: lease.holder },
  });
}

/** Runs `work` under the lease; answers `{ ran: false }` without running it when another instance holds it. */
export async function withJobLock<T>(
  name: string,
  ttl_ms: number,
  work: () => Promise<T>,
): Promise<{ ran: true; result: T } | { ran: false }> {
  const lease = await acquireJobLock(name, ttl_ms);
  if (!lease) return { ran: false };
  try {
    return { ran: true, result: await work() };
  } finally {
    await releaseJobLock(lease);
  }
}
