// The rows of method_versions that every change of a method's program leaves: version 1 for a
// method that has none yet, and an approved "edit" version when a method is edited directly.
import type { Transaction } from "sequelize";
import { execute } from "../../query";

/** Version 1 from the method's current program, for a method that has no version yet. */
export async function ensureFirstVersion(methodId: number, transaction: Transaction): Promise<void> {
  await execute(
    `INSERT INTO method_versions (method_id, version, program, run_time_min, origin, created_at, approved_at)
     SELECT id, 1, program, run_time_min, 'initial', created_at, created_at FROM methods m
      WHERE m.id = ? AND NOT EXISTS (SELECT 1 FROM method_versions v WHERE v.method_id = m.id)`,
    { replacements: [methodId], transaction },
  );
}

/**
 * After a direct edit (by someone allowed to manage methods, as before versions existed): the
 * method's new program as the next version, approved by the editor. Call `ensureFirstVersion`
 * before the edit, so that version 1 is the program as it was.
 */
export async function recordEditedVersion(methodId: number, actorId: number, transaction: Transaction): Promise<void> {
  await execute(
    `INSERT INTO method_versions (method_id, version, program, run_time_min, origin, created_by, created_at, approved_by, approved_at)
     SELECT m.id, (SELECT MAX(v.version) + 1 FROM method_versions v WHERE v.method_id = m.id), m.program, m.run_time_min, 'edit', ?, NOW(3), ?, NOW(3)
       FROM methods m WHERE m.id = ?`,
    { replacements: [actorId, actorId, methodId], transaction },
  );
}
