import { getDb } from "@/db";
import { requestAddress } from "@/lib/auth/guard";
import { route } from "@/lib/http";
import { getStorage } from "@/lib/storage";
import { requireUpload, UPLOAD_ROLES } from "@/lib/uploads/access";

type Params = { id: string };

/**
 * The file itself, only to the client it belongs to and their clinic's therapists and assistants; audited as
 * `upload.download`. Sent as an attachment with the detected type and nosniff, so a browser never renders it as a page.
 */
export const GET = route<Params>(UPLOAD_ROLES, async ({ actor, request, params }) => {
  const upload = await requireUpload(actor, params.id, { db: getDb(), address: requestAddress(request.headers), action: "upload.download" });
  const bytes = await getStorage().get(upload.storageKey);
  const filename = `${upload.kind}-${upload.createdAt.toISOString().slice(0, 10)}-${upload.id.slice(0, 8)}.${upload.extension}`;
  return new Response(new Uint8Array(bytes), {
    headers: {
      "Content-Type": upload.mediaType,
      "Content-Length": String(bytes.byteLength),
      "Content-Disposition": `attachment; filename="${filename}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
      "X-Content-SHA256": upload.sha256,
    },
  });
});
