/**
 * What the recipe form offers in its lists, read from the reagent catalogue on the server and
 * handed to the island as props, so the island's first load needs ids and names, not the catalogue.
 */
import { ADDITIVE_UNITS, type AdditiveUnit } from "../chem/additive-units";
import { reagents, type PhysicalForm, type Reagent } from "../chem/reagents";

export interface ReagentChoice {
  id: string;
  name: string;
}

export interface RecipeChoices {
  /** Liquids with a polarity index: what a mobile phase is mixed from. */
  solvents: ReagentChoice[];
  /** Acids, bases and salts: buffer reagents and additives. */
  solutes: ReagentChoice[];
  additiveUnits: readonly AdditiveUnit[];
}

const choice = (r: ReagentChoice): ReagentChoice => ({ id: r.id, name: r.name });

export function recipeChoices(): RecipeChoices {
  return {
    solvents: reagents.filter((r) => r.form === "liquid" && r.polarityIndex !== undefined).map(choice),
    solutes: reagents.filter((r) => r.role !== "solvent").map(choice),
    additiveUnits: ADDITIVE_UNITS,
  };
}

/** A reagent the stock-lot form offers: any reagent of the catalogue, as received. */
export interface LotReagentChoice extends ReagentChoice {
  form: PhysicalForm;
  role: Reagent["role"];
  /** The catalogue's typical assay of the product as sold (mass fraction), the fallback when a lot records none. */
  purity_w_w?: { value: number };
}

export function lotReagentChoices(): LotReagentChoice[] {
  return reagents.map((r) => ({
    id: r.id,
    name: r.name,
    form: r.form,
    role: r.role,
    ...(r.purity_w_w ? { purity_w_w: { value: r.purity_w_w.value } } : {}),
  }));
}
