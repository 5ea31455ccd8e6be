/**
 * What the preparation services answer and their screens read: recipes, stock lots, batches and
 * their bottles. Types only, shared by services, pages and islands.
 */
import type { RecipeSpec } from "../schemas/recipes";
import type { Deviation } from "./deviations";
import type { AssayUsed } from "./lot-assays";

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
  /** % w/w from the certificate; null when not recorded (the catalogue's typical value is used). */
  assayPercent: number | null;
  density_g_mL: number | null;
}

export interface StockLotSummary {
  id: number;
  reagent: string;
  reagentName: string;
  unit: "mL" | "g";
  lotNumber: string;
  supplier: string;
  grade: string;
  receivedOn: string;
  openedOn: string | null;
  expiresOn: string;
  quantity: number;
  remaining: number;
  room: string | null;
  /** Assay from the certificate, % w/w; null when not recorded (the catalogue's typical value applies). */
  assayPercent: number | null;
  /** Density at 20 °C from the certificate (solutions), g/mL. */
  density_g_mL: number | null;
  hasCertificate: boolean;
  certificateName: string | null;
  expired: boolean;
  low: boolean;
  usable: boolean;
}

export type BottleStatus = "ready" | "in_use" | "empty" | "discarded";

export interface BottleDetail {
  number: number;
  status: BottleStatus;
  discarded_mL: number | null;
}

export interface BatchComponentDetail {
  reagent: string;
  name: string;
  role: string;
  unit: "mL" | "g";
  target: number;
  actual: number | null;
  stockLotId: number | null;
  lotNumber: string | null;
  /** The assay the target was computed with (null for solvents and batches recorded before assays were kept). */
  assay: AssayUsed | null;
}

/** One batch as `GET /api/batches/:id` and its page show it. */
export interface BatchDetail {
  id: number;
  code: string;
  recipeId: number;
  recipeCode: string;
  recipeName: string;
  recipeVersion: number;
  recipeVersionId: number;
  channel: string | null;
  spec: RecipeSpec | null;
  composition: string;
  storage: string | null;
  detection_nm: number | null;
  volume_mL: number;
  remaining_mL: number;
  bottles: number;
  bottleSize_mL: number;
  temperature_C: number;
  measuredPH: number | null;
  phMeterTemperature_C: number | null;
  targetPH: number | null;
  preparedAt: string;
  expiresAt: string;
  expiryReason: string | null;
  preparedBy: string;
  status: BottleStatus;
  /** The room the batch is kept in; null for batches recorded before rooms were asked for. */
  room: string | null;
  expired: boolean;
  deviations: Deviation[];
  deviationReason: string | null;
  components: BatchComponentDetail[];
  bottleList: BottleDetail[];
}

/** `POST /api/batches`: the batch, and whether this submit recorded it (false: an earlier one did). */
export interface RecordedBatch {
  created: boolean;
  batch: BatchDetail;
}

/** A batch in the list, newest first. */
export interface BatchSummary {
  id: number;
  code: string;
  recipeCode: string;
  recipeName: string;
  recipeVersion: number;
  channel: string | null;
  volume_mL: number;
  remaining_mL: number;
  bottles: number;
  status: string;
  preparedAt: string;
  expiresAt: string;
  preparedBy: string;
  measuredPH: number | null;
  expired: boolean;
}
