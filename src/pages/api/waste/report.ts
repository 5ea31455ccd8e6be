import { wasteReportQuery } from "../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { takeToken } from "../../../lib/server/rate-limit";
import { wasteReportData } from "../../../lib/server/services/waste/documents";
import { reportCsv, reportPdf } from "../../../lib/waste/report";

/** The waste report of a period as JSON, CSV or PDF. */
export const GET = endpoint(async ({ locals, url }) => {
  const user = requirePermission(locals, "read:waste");
  const { from, to, format } = validate(queryOf(url), wasteReportQuery);
  // The files are exports; the JSON is what the waste page itself shows.
  if (format === "csv" || format === "pdf") await takeToken(user.id, "export");
  const data = await wasteReportData({ from, to });
  const name = `decant-waste-${from}-to-${to}`;
  if (format === "csv") {
    return new Response(reportCsv(data), {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${name}.csv"`,
        "cache-control": "no-store",
      },
    });
  }
  if (format === "pdf") {
    const bytes = await reportPdf(data);
    return new Response(new Uint8Array(bytes), {
      headers: {
        "content-type": "application/pdf",
        "content-disposition": `attachment; filename="${name}.pdf"`,
        "cache-control": "no-store",
      },
    });
  }
  return json(data);
});
