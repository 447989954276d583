import { getDb } from "@/db";
import { auditActorEvent } from "@/lib/audit";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { buildClientExport } from "@/lib/export/client-export";
import { route } from "@/lib/http";
import { getStorage } from "@/lib/storage";

/** Everything Kinarc holds about one client, as a zip of JSON and files (admin and therapists; audited). */
export const GET = route<{ id: string }>(["admin", "therapist"], async ({ actor, request, params }) => {
  const db = getDb();
  const address = requestAddress(request.headers);
  const client = await requireClientRecord(actor, params.id, { db, address, purpose: "client.export" });
  const { zip, files } = await buildClientExport(db, getStorage(), client.id);
  await auditActorEvent(db, actor, { action: "client.export", subjectType: "client", subjectId: client.id, clientId: client.id, address, detail: { files: files.length, bytes: zip.byteLength } });
  return new Response(new Uint8Array(zip), {
    headers: {
      "Content-Type": "application/zip",
      "Content-Disposition": `attachment; filename="kinarc-export-${client.id.slice(0, 8)}-${new Date().toISOString().slice(0, 10)}.zip"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
});
