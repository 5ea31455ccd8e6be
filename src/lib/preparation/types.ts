// What the recipe and batch routes send and what the preparation islands receive: shared by the
// services that build these values and the islands that show them.
import type { RecipeSpec } from "../schemas/recipes";

export type RecipeState = "approved" | "pending" | "retired";

export interface RecipeSummary {
  id: number;
  code: string;
  name: string;
  channel: string | null;
  state: RecipeState;
  latestVersion: number;
  approvedVersion: number | null;
  description: string;
  updatedAt: string;
  author: string | null;
}

export interface RecipeVersionDetail {
  id: number;
  version: number;
  spec: RecipeSpec;
  detection_nm: number | null;
  storage: string | null;
  notes: string | null;
  createdAt: string;
  createdBy: string | null;
  createdById: number | null;
  approvedAt: string | null;
  approvedBy: string | null;
  batches: number;
}

export interface RecipeDetail extends RecipeSummary {
  versions: RecipeVersionDetail[];
}

/** A recipe that can be prepared, with its latest approved version (for the preparation form). */
export interface PreparableRecipe {
  recipeId: number;
  versionId: number;
  version: number;
  code: string;
  name: string;
  channel: string | null;
  detection_nm: number | null;
  storage: string | null;
  spec: RecipeSpec;
}

/** A recipe as the preparation page hands it to the form (without the recipe id). */
export type FormRecipe = Omit<PreparableRecipe, "recipeId">;

/** A stock lot the preparation form offers for a component. */
export interface FormLot {
  id: number;
  reagent: string;
  lotNumber: string;
  grade: string;
  expiresOn: string;
  remaining: number;
  unit: "mL" | "g";
  low: boolean;
}
