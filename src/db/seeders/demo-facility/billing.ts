// The demo facility's price lists and settings (invented prices; common-practice defaults).
import type { DemoClock } from "../../demo-time";

export function billingRows(at: DemoClock, t0: Date) {
  const rate = (kind: string, reagent: string | null, list: string, unit: string, amount: number) => ({
    kind,
    reagent_id: reagent,
    price_list: list,
    unit,
    amount_minor: amount,
    currency: "EUR",
    effective_from: at(365),
    created_by: 2,
    created_at: t0,
  });
  const rates = [
    rate("reagent", "acetonitrile", "internal", "L", 4_200),
    rate("reagent", "acetonitrile", "external", "L", 7_900),
    rate("reagent", "methanol", "internal", "L", 1_900),
    rate("reagent", "methanol", "external", "L", 3_600),
    rate("reagent", "water", "internal", "L", 150),
    rate("reagent", "water", "external", "L", 400),
    rate("reagent", "formic-acid", "internal", "L", 21_000),
    rate("reagent", "formic-acid", "external", "L", 38_000),
    rate("reagent", "isopropanol", "internal", "L", 2_600),
    rate("reagent", "isopropanol", "external", "L", 4_900),
    rate("reagent", "trifluoroacetic-acid", "internal", "L", 95_000),
    rate("reagent", "trifluoroacetic-acid", "external", "L", 160_000),
    rate("reagent", "phosphoric-acid", "internal", "L", 6_000),
    rate("reagent", "phosphoric-acid", "external", "L", 11_000),
    rate("reagent", "ammonium-formate", "internal", "g", 30),
    rate("reagent", "ammonium-formate", "external", "g", 60),
    rate("reagent", "ammonium-acetate", "internal", "g", 20),
    rate("reagent", "ammonium-acetate", "external", "g", 45),
    rate("reagent", "potassium-dihydrogen-phosphate", "internal", "g", 9),
    rate("reagent", "potassium-dihydrogen-phosphate", "external", "g", 20),
    rate("reagent", "dipotassium-hydrogen-phosphate", "internal", "g", 10),
    rate("reagent", "dipotassium-hydrogen-phosphate", "external", "g", 22),
    rate("preparation_fee", null, "internal", "batch", 1_200),
    rate("preparation_fee", null, "external", "batch", 2_500),
    rate("injection_fee", null, "internal", "injection", 0),
    rate("injection_fee", null, "external", "injection", 150),
  ];

  const settings = [
    { key: "facility.name", value: JSON.stringify("Veldmoor Separation Science Core"), updated_at: t0 },
    { key: "expiry.aqueousBuffer_h", value: JSON.stringify(48), updated_at: t0 },
    { key: "expiry.organicMix_days", value: JSON.stringify(30), updated_at: t0 },
    { key: "waste.fullThreshold_percent", value: JSON.stringify(80), updated_at: t0 },
    { key: "waste.accumulationLimit_days", value: JSON.stringify(180), updated_at: t0 },
    { key: "flammables.roomLimit_L", value: JSON.stringify({ "B2.14": 50, "B2.16": 25 }), updated_at: t0 },
    { key: "invoices.daysUntilDue", value: JSON.stringify(30), updated_at: t0 },
  ];
  return { rates, settings };
}
