/**
 * Recipes and their versions. A technician writes a recipe; a manager approves a version. A
 * version that is approved, or that a batch was made from, is never changed: editing it makes
 * the next version, which waits for approval while batches go on being made from the last
 * approved one.
 */
import { UniqueConstraintError, type Transaction } from "sequelize";
import { describeSpec } from "../../preparation/plan";
import type { PreparableRecipe, RecipeDetail, RecipeState, RecipeSummary } from "../../preparation/types";
import { recipeSpecSchema, type RecipeInput, type RecipeSpec } from "../../schemas/recipes";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { execute, jsonColumn, select, selectOne } from "../query";
import { inTransaction } from "./sql";

function parseSpec(raw: unknown): RecipeSpec {
  return recipeSpecSchema.parse(jsonColumn(raw));
}

interface SummaryRow {
  id: number;
  code: string;
  name: string;
  channel: string | null;
  status: string;
  latest: number;
  approved: number | null;
  updated_at: Date;
  author: string | null;
  spec: unknown;
}

const SORT_COLUMNS: Record<string, string> = {
  code: "r.code",
  name: "r.name",
  channel: "r.channel",
  version: "latest",
  updated: "r.updated_at",
};

export async function listRecipes(
  query: {
    q?: string | undefined;
    status?: RecipeState | undefined;
    channel?: string | undefined;
    sort?: string;
    dir?: "asc" | "desc";
  } = {},
): Promise<RecipeSummary[]> {
  const sort = SORT_COLUMNS[query.sort ?? "code"] ?? "r.code";
  const dir = query.dir === "desc" ? "DESC" : "ASC";
  const rows = await select<SummaryRow>(
    `SELECT r.id, r.code, r.name, r.channel, r.status, r.updated_at, u.name AS author,
            (SELECT MAX(v.version) FROM recipe_versions v WHERE v.recipe_id = r.id) AS latest,
            (SELECT MAX(v.version) FROM recipe_versions v WHERE v.recipe_id = r.id AND v.approved_at IS NOT NULL) AS approved,
            (SELECT v.spec FROM recipe_versions v WHERE v.recipe_id = r.id ORDER BY v.version DESC LIMIT 1) AS spec
       FROM recipes r LEFT JOIN users u ON u.id = r.created_by
      WHERE (:q IS NULL OR r.code LIKE :like OR r.name LIKE :like)
        AND (:channel IS NULL OR r.channel = :channel)
      ORDER BY ${sort} ${dir}, r.id ${dir}`,
    { replacements: { q: query.q || null, like: `%${query.q ?? ""}%`, channel: query.channel ?? null } },
  );
  const out = rows.map((r): RecipeSummary => {
    const state: RecipeState = r.status === "retired" ? "retired" : r.approved !== null && r.approved === r.latest ? "approved" : "pending";
    let description = "";
    try {
      description = describeSpec(parseSpec(r.spec));
    } catch {
      description = "(specification no longer valid)";
    }
    return {
      id: r.id,
      code: r.code,
      name: r.name,
      channel: r.channel,
      state,
      latestVersion: r.latest,
      approvedVersion: r.approved,
      description,
      updatedAt: new Date(r.updated_at).toISOString(),
      author: r.author,
    };
  });
  return query.status ? out.filter((r) => r.state === query.status) : out;
}

export async function getRecipe(id: number): Promise<RecipeDetail> {
  const [summary] = (await listRecipes()).filter((r) => r.id === id);
  if (!summary) throw new HttpError(404, `No recipe with id ${id}.`);
  const rows = await select<{
    id: number;
    version: number;
    spec: unknown;
    detection_nm: number | null;
    storage: string | null;
    notes: string | null;
    created_at: Date;
    created_by: number | null;
    author: string | null;
    approved_at: Date | null;
    approver: string | null;
    batches: number;
  }>(
    `SELECT v.id, v.version, v.spec, v.detection_nm, v.storage, v.notes, v.created_at, v.created_by, a.name AS author, v.approved_at, p.name AS approver,
            (SELECT COUNT(*) FROM batches b WHERE b.recipe_version_id = v.id) AS batches
       FROM recipe_versions v LEFT JOIN users a ON a.id = v.created_by LEFT JOIN users p ON p.id = v.approved_by
      WHERE v.recipe_id = ? ORDER BY v.version DESC`,
    { replacements: [id] },
  );
  return {
    ...summary,
    versions: rows.map((v) => ({
      id: v.id,
      version: v.version,
      spec: parseSpec(v.spec),
      detection_nm: v.detection_nm,
      storage: v.storage,
      notes: v.notes,
      createdAt: new Date(v.created_at).toISOString(),
      createdBy: v.author,
      createdById: v.created_by,
      approvedAt: v.approved_at ? new Date(v.approved_at).toISOString() : null,
      approvedBy: v.approver,
      batches: v.batches,
    })),
  };
}

function codeFrom(name: string): string {
  const letters = name
    .toUpperCase()
    .replace(/[^A-Z0-9 ]+/g, " ")
    .trim()
    .split(/\s+/)
    .filter(Boolean)
    .map((w) => (/^\d/.test(w) ? w : w.slice(0, 3)))
    .join("-");
  return `MP-${letters}`.slice(0, 28).replace(/-+$/, "");
}

async function uniqueCode(base: string): Promise<string> {
  const taken = new Set(
    (await select<{ code: string }>("SELECT code FROM recipes WHERE code LIKE ?", { replacements: [`${base}%`] })).map((r) => r.code),
  );
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}-${n}`)) return `${base}-${n}`;
}

export async function createRecipe(input: RecipeInput, actor: SignedInUser, ip: string | null = null): Promise<RecipeDetail> {
  const code = input.code ?? (await uniqueCode(codeFrom(input.name)));
  let id = 0;
  try {
    await inTransaction(getSequelize(), async (transaction) => {
      ({ insertId: id } = await execute(
        "INSERT INTO recipes (code, name, channel, status, created_by, created_at, updated_at) VALUES (?, ?, ?, 'draft', ?, NOW(3), NOW(3))",
        {
          replacements: [code, input.name, input.channel ?? null, actor.id],
          transaction,
        },
      ));
      await execute(
        "INSERT INTO recipe_versions (recipe_id, version, spec, detection_nm, storage, notes, created_by, created_at) VALUES (?, 1, ?, ?, ?, ?, ?, NOW(3))",
        {
          replacements: [id, JSON.stringify(input.spec), input.detection_nm ?? null, input.storage ?? null, input.notes ?? null, actor.id],
          transaction,
        },
      );
      await recordAudit(
        { actorId: actor.id, action: "create", entity: "recipe", entityId: id, ip, after: { code, ...input } },
        transaction,
      );
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new HttpError(409, `code: a recipe with the code ${code} exists already`);
    throw error;
  }
  return getRecipe(id);
}

/** Edits the pending version in place, or adds the next version when the latest is approved or used. */
export async function updateRecipe(
  id: number,
  input: RecipeInput,
  actor: SignedInUser,
  ip: string | null = null,
): Promise<{ recipe: RecipeDetail; newVersion: boolean }> {
  const before = await getRecipe(id);
  if (before.state === "retired") throw new HttpError(409, "This recipe is retired; it can no longer be changed.");
  const latest = before.versions[0]!;
  const frozen = latest.approvedAt !== null || latest.batches > 0;
  await inTransaction(getSequelize(), async (transaction) => {
    await execute("UPDATE recipes SET name = ?, channel = ?, updated_at = NOW(3) WHERE id = ?", {
      replacements: [input.name, input.channel ?? null, id],
      transaction,
    });
    if (frozen) {
      await execute(
        "INSERT INTO recipe_versions (recipe_id, version, spec, detection_nm, storage, notes, created_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, NOW(3))",
        {
          replacements: [
            id,
            latest.version + 1,
            JSON.stringify(input.spec),
            input.detection_nm ?? null,
            input.storage ?? null,
            input.notes ?? null,
            actor.id,
          ],
          transaction,
        },
      );
    } else {
      await execute("UPDATE recipe_versions SET spec = ?, detection_nm = ?, storage = ?, notes = ? WHERE id = ?", {
        replacements: [JSON.stringify(input.spec), input.detection_nm ?? null, input.storage ?? null, input.notes ?? null, latest.id],
        transaction,
      });
    }
    await recordAudit(
      {
        actorId: actor.id,
        action: frozen ? "new-version" : "update",
        entity: "recipe",
        entityId: id,
        ip,
        before: { version: latest.version, spec: latest.spec },
        after: { version: frozen ? latest.version + 1 : latest.version, ...input },
      },
      transaction,
    );
  });
  return { recipe: await getRecipe(id), newVersion: frozen };
}

/** Approves the latest version. The author of a version cannot approve it (four eyes). */
export async function approveRecipe(id: number, version: number, actor: SignedInUser, ip: string | null = null): Promise<RecipeDetail> {
  const recipe = await getRecipe(id);
  const latest = recipe.versions[0]!;
  if (latest.version !== version)
    throw new HttpError(409, `version: version ${version} is not the latest (v${latest.version}); reload and review the latest.`);
  if (latest.approvedAt) throw new HttpError(409, `Version ${version} is approved already.`);
  if (latest.createdById === actor.id) throw new HttpError(403, "A recipe version is approved by someone other than its author.");
  await inTransaction(getSequelize(), async (transaction) => {
    await execute("UPDATE recipe_versions SET approved_by = ?, approved_at = NOW(3) WHERE id = ? AND approved_at IS NULL", {
      replacements: [actor.id, latest.id],
      transaction,
    });
    await execute("UPDATE recipes SET status = 'approved', updated_at = NOW(3) WHERE id = ?", { replacements: [id], transaction });
    await recordAudit({ actorId: actor.id, action: "approve", entity: "recipe", entityId: id, ip, after: { version } }, transaction);
  });
  return getRecipe(id);
}

/** A recipe version with its recipe, as preparation uses it. */
interface VersionRow {
  recipe_id: number;
  id: number;
  version: number;
  code: string;
  name: string;
  channel: string | null;
  detection_nm: number | null;
  storage: string | null;
  spec: unknown;
  approved_at: Date | null;
  status: string;
}

const SELECT_VERSIONS = `SELECT v.recipe_id, v.id, v.version, r.code, r.name, r.channel, v.detection_nm, v.storage, v.spec, v.approved_at, r.status
                           FROM recipe_versions v JOIN recipes r ON r.id = v.recipe_id`;

/** Throws when the stored specification no longer parses. */
const preparable = (r: VersionRow): PreparableRecipe => ({
  recipeId: r.recipe_id,
  versionId: r.id,
  version: r.version,
  code: r.code,
  name: r.name,
  channel: r.channel,
  detection_nm: r.detection_nm,
  storage: r.storage,
  spec: parseSpec(r.spec),
});

export async function preparableRecipes(): Promise<PreparableRecipe[]> {
  const rows = await select<VersionRow>(
    `${SELECT_VERSIONS}
      WHERE r.status <> 'retired' AND v.approved_at IS NOT NULL
        AND v.version = (SELECT MAX(w.version) FROM recipe_versions w WHERE w.recipe_id = v.recipe_id AND w.approved_at IS NOT NULL)
      ORDER BY r.code`,
  );
  const out: PreparableRecipe[] = [];
  for (const r of rows) {
    try {
      out.push(preparable(r));
    } catch {
      // A version whose stored specification no longer parses is not offered for preparation.
    }
  }
  return out;
}

export async function getRecipeVersion(
  versionId: number,
  transaction?: Transaction,
): Promise<PreparableRecipe & { approved: boolean; retired: boolean }> {
  const r = await selectOne<VersionRow>(`${SELECT_VERSIONS} WHERE v.id = ?`, { replacements: [versionId], transaction });
  if (!r) throw new HttpError(400, `recipeVersionId: no recipe version ${versionId}`);
  return { ...preparable(r), approved: r.approved_at !== null, retired: r.status === "retired" };
}
