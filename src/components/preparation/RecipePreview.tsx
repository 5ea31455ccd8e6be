import { useMemo } from "react";
import { ChemInputError } from "../../lib/chem/warnings";
import { describeSpec, preparationPlan } from "../../lib/preparation/plan";
import { recipeSpecSchema } from "../../lib/schemas/recipes";

/**
 * A recipe in words and what 1 L of it takes, worked out as the form changes. It carries the
 * chemistry, the catalogue and zod, so the recipe form loads it on demand (see RecipeForm).
 */
export default function RecipePreview({ spec, detection_nm }: { spec: unknown; detection_nm: number | null }) {
  const specKey = JSON.stringify(spec);
  const preview = useMemo(() => {
    const parsed = recipeSpecSchema.safeParse(spec);
    if (!parsed.success) return { text: null, error: parsed.error.issues[0]?.message ?? "Incomplete", plan: null };
    try {
      return { text: describeSpec(parsed.data), error: null, plan: preparationPlan({ spec: parsed.data, volume_mL: 1000, detection_nm }) };
    } catch (e) {
      return { text: describeSpec(parsed.data), error: e instanceof ChemInputError ? e.message : "Cannot be computed", plan: null };
    }
    // The form hands over a new object on every render; the preview follows its content.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [specKey, detection_nm]);

  return (
    <>
      <p className="mt-1" data-testid="recipe-description">
        {preview.text ?? "–"}
      </p>
      {preview.error && <p className="field-error mt-2">{preview.error}</p>}
      {preview.plan && (
        <>
          <h3 className="mt-3 font-medium">For 1 L</h3>
          <ul className="mt-1 space-y-0.5" data-testid="recipe-litre">
            {preview.plan.components.map((c) => (
              <li key={`${c.role}:${c.reagent}`} className="flex justify-between gap-2">
                <span>{c.name}</span>
                <span className="num">
                  {c.target.toFixed(c.target >= 10 ? 1 : 3)} {c.unit}
                </span>
              </li>
            ))}
          </ul>
          {preview.plan.warnings.length > 0 && (
            <ul className="notice mt-3 ml-0 list-none space-y-1">
              {preview.plan.warnings.map((w) => (
                <li key={`${w.code}:${w.reagent ?? ""}`}>{w.message}</li>
              ))}
            </ul>
          )}
        </>
      )}
    </>
  );
}
