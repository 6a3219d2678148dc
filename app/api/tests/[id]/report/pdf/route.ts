import { z } from "zod";
import { renderReportPdf } from "@/lib/report/pdf/renderReportPdf";
import { loadReport } from "@/app/tests/[id]/report/loadReport";
import { recordId } from "../../../../../schemas";
import { routeAccess } from "@/app/access";
import { audit } from "@/lib/store/tests";

export const dynamic = "force-dynamic";

const paramsSchema = z.object({ id: recordId("test") });
const querySchema = z.object({ report: recordId("report version").optional() });

/** The report of a test as PDF: the current version, or `?report=<id>` for a given version (audited: `report-pdf-downloaded`). */
export async function GET(request: Request, { params }: { params: Promise<{ id: string }> }) {
  const access = await routeAccess();
  if (access instanceof Response) return access;
  const p = paramsSchema.safeParse(await params);
  const q = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!p.success || !q.success) return Response.json({ error: "Invalid test or report id" }, { status: 400 });
  const loaded = loadReport(p.data.id, q.data.report);
  if (!loaded) return Response.json({ error: "No report for this test" }, { status: 404 });
  const pdf = await renderReportPdf(loaded.model);
  // a signed version that a newer signed version amends is named so, not just "signed"
  const superseded =
    loaded.report.status === "signed" && loaded.versions.some((v) => v.id > loaded.report.id && v.status === "signed");
  const name = `cpet-report-test${p.data.id}-v${loaded.report.version}-${superseded ? "superseded" : loaded.report.status}.pdf`;
  audit(
    access.actor,
    "report-pdf-downloaded",
    p.data.id,
    `report ${loaded.report.id} (version ${loaded.report.version}, ${name})`,
  );
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "no-store",
    },
  });
}
