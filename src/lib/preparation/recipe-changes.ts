/** What changed from one recipe version to the next, in words, for the recipe page and the approval. */
import type { RecipeSpec } from "../schemas/recipes";
import { describeSpec } from "./plan";

interface VersionLike {
  spec: RecipeSpec;
  detection_nm: number | null;
  storage: string | null;
  notes: string | null;
}

export function versionChanges(previous: VersionLike, next: VersionLike): string[] {
  const out: string[] = [];
  const [a, b] = [describeSpec(previous.spec), describeSpec(next.spec)];
  if (a !== b) out.push(`Composition: ${a} → ${b}`);
  if (previous.spec.labile !== next.spec.labile) out.push(next.spec.labile ? "Now marked labile" : "No longer marked labile");
  if (previous.detection_nm !== next.detection_nm) out.push(`Detection: ${previous.detection_nm ?? "–"} → ${next.detection_nm ?? "–"} nm`);
  if ((previous.storage ?? "") !== (next.storage ?? "")) out.push(`Storage: ${previous.storage ?? "–"} → ${next.storage ?? "–"}`);
  if ((previous.notes ?? "") !== (next.notes ?? "")) out.push("Notes changed");
  return out;
}
