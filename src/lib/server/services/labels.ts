/** Bottle labels for a batch, on one of the facility's label stocks. */
import { labelContentOf } from "../../labels/batch-label";
import { renderLabels } from "../../labels/label-pdf";
import { HttpError } from "../http";
import { getBatch } from "./batches";
import { getFacilitySettings } from "./facility-settings";
import { getPreparationSettings } from "./preparation-settings";

export async function batchLabels(
  batchId: number,
  options: { copies?: number | undefined; stock?: string | undefined; bottle?: number | undefined },
) {
  const batch = await getBatch(batchId);
  const [settings, facility] = await Promise.all([getPreparationSettings(), getFacilitySettings()]);
  const stockId = options.stock ?? settings.defaultLabelStockId;
  const stock = settings.labelStocks.find((s) => s.id === stockId);
  if (!stock) throw new HttpError(400, `stock: no label stock "${stockId}"; one of ${settings.labelStocks.map((s) => s.id).join(", ")}`);
  if (options.bottle !== undefined && options.bottle > batch.bottles)
    throw new HttpError(400, `bottle: batch ${batch.code} has ${batch.bottles} bottle(s)`);
  const copies = options.copies ?? (options.bottle !== undefined ? 1 : batch.bottles);
  const rendered = await renderLabels({
    content: labelContentOf(batch, facility.timeZone),
    stock,
    copies,
    bottle: options.bottle,
    title: `Labels for batch ${batch.code}`,
  });
  return { bytes: rendered.bytes, pages: rendered.pages, labels: rendered.labels.length, fileName: `${batch.code}-labels-${stock.id}.pdf` };
}
