import { downloadUpload } from "@/lib/store/tests";
import { routeAccess } from "@/app/access";

export const dynamic = "force-dynamic";

/** The original upload, byte for byte (audited: `original-file-downloaded`). */
export async function GET(_req: Request, { params }: { params: Promise<{ id: string }> }) {
  const access = await routeAccess();
  if (access instanceof Response) return access;
  const { id } = await params;
  const n = Number(id);
  if (!Number.isInteger(n)) return new Response("Not found", { status: 404 });
  const up = downloadUpload(n, access.actor);
  if (!up) return new Response("Not found", { status: 404 });
  return new Response(new Uint8Array(up.bytes), {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": `attachment; filename="${up.fileName.replace(/[^\w.\-]/g, "_")}"`,
    },
  });
}
