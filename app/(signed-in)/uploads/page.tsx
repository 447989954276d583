import Link from "next/link";
import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { listClients } from "@/db/queries/clients";
import { clipAttemptSummaries, listUploads } from "@/db/queries/uploads";
import { SafetyNote } from "@/components/safety-note";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import { ReviewButton } from "@/components/uploads/review-button";
import { UploadForm } from "@/components/uploads/upload-form";
import { auditActorEvent } from "@/lib/audit";
import { currentActor } from "@/lib/auth/guard";
import { MOTION_IDS, MOTIONS } from "@/lib/motions/catalog";
import { UPLOAD_ROLES } from "@/lib/uploads/access";
import { describeLimit } from "@/lib/uploads/content";

export const metadata = { title: "Clips and documents" };

const sizeLabel = (bytes: number) => (bytes >= 1024 * 1024 ? `${(bytes / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1024))} KB`);

/** Clients send clips and documents; therapists and assistants see everything sent by or for their clinic's clients. */
export default async function UploadsPage() {
  const actor = await currentActor();
  if (!actor || !(UPLOAD_ROLES as readonly string[]).includes(actor.role)) notFound();
  const db = getDb();
  const isClient = actor.role === "client";
  const rows = await listUploads(db, actor.clinicId, { clientId: isClient ? actor.clientId! : undefined });
  const measured = await clipAttemptSummaries(
    db,
    actor.clinicId,
    rows.flatMap((r) => (r.upload.attemptId ? [r.upload.attemptId] : [])),
  );
  await auditActorEvent(db, actor, { action: "upload.list", clientId: isClient ? actor.clientId : null });
  const motions = MOTION_IDS.map((id) => ({ value: id, label: MOTIONS[id].label, digits: MOTIONS[id].digits, positions: MOTIONS[id].testPosition }));
  const limits = { clip: describeLimit("clip"), document: describeLimit("document") };
  const clientOptions = isClient
    ? undefined
    : (await listClients(db, actor.clinicId, { sort: "name", dir: "asc", page: 1, pageSize: 100 })).rows.map((c) => ({ value: c.id, label: `${c.familyName}, ${c.givenName}` }));
  return (
    <>
      <PageTitle
        title={isClient ? "Send a clip or a document" : "Clips and documents"}
        subtitle={isClient ? "For when you cannot join a video visit, or to share a referral letter or photo." : "Sent by clients or attached by the team; not yet reviewed first."}
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_1fr]">
        <Card title={isClient ? "Send" : "Attach a document for a client"}>
          {isClient ? (
            <div className="mb-4">
              <SafetyNote compact />
            </div>
          ) : null}
          <UploadForm clientId={isClient ? actor.clientId! : undefined} clients={clientOptions} motions={motions} limits={limits} allowClip={isClient} />
        </Card>
        <Card title={isClient ? "What you have sent" : "Received"}>
          {rows.length === 0 ? (
            <p className="text-sm text-ink-soft">Nothing yet.</p>
          ) : (
            <ul className="divide-y divide-sand-100" data-testid="upload-list">
              {rows.map(({ upload: u, clientGiven, clientFamily, uploaderName }) => (
                <li key={u.id} className="flex flex-wrap items-center gap-3 py-3 text-sm" data-testid="upload-row">
                  <div className="min-w-0 flex-1">
                    <p className="font-medium">
                      {u.kind === "clip" ? `Clip: ${u.motion && u.motion in MOTIONS ? MOTIONS[u.motion as keyof typeof MOTIONS].label : "movement"}${u.side ? `, ${u.side}` : ""}` : "Document"}{" "}
                      <span className="font-normal text-ink-faint">
                        · {u.mediaType} · {sizeLabel(u.bytes)}
                      </span>
                    </p>
                    <p className="text-ink-soft">
                      {isClient ? "" : `${clientGiven} ${clientFamily} · `}
                      {u.originalName} · sent {u.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC{uploaderName && !isClient ? ` by ${uploaderName}` : ""}
                    </p>
                    {u.note ? <p className="text-ink-soft">“{u.note}”</p> : null}
                    {u.kind === "clip" ? <ClipStatus summary={u.attemptId ? (measured.get(u.attemptId) ?? null) : null} forClient={isClient} /> : null}
                    {u.kind === "clip" && !isClient ? (
                      // Fetched only when played; the same owner-checked, audited route as the download.
                      <video controls preload="none" className="mt-2 max-h-64 w-full rounded-lg bg-ink" src={`/api/v1/uploads/${u.id}/file`} aria-label={`Clip from ${clientGiven} ${clientFamily}`} />
                    ) : null}
                    <p className="font-mono text-xs text-ink-faint" title="SHA-256 of the stored file">
                      SHA-256 {u.sha256.slice(0, 16)}…
                    </p>
                  </div>
                  {u.reviewedAt ? <Badge tone="good">Reviewed</Badge> : <Badge tone="caution">Not reviewed</Badge>}
                  <a className="text-tide-700 underline" href={`/api/v1/uploads/${u.id}/file`}>
                    Download
                  </a>
                  {!isClient && u.kind === "clip" ? (
                    <Link className="font-semibold text-tide-700 underline" href={`/uploads/${u.id}`} data-testid="review-clip">
                      {u.attemptId ? "Review the measurement" : "Measure and review"}
                    </Link>
                  ) : null}
                  {!isClient && !u.reviewedAt ? <ReviewButton uploadId={u.id} /> : null}
                </li>
              ))}
            </ul>
          )}
          {!isClient ? (
            <p className="mt-3 text-xs text-ink-faint">
              A clip is measured with the same hand tracking as a live check, in the client&apos;s browser right after it is sent; if that never
              finished, open it to measure it in this browser.
            </p>
          ) : null}
        </Card>
      </div>
    </>
  );
}

/** Whether a clip has been measured yet; staff also see the headline numbers (the review page has the rest). */
function ClipStatus({ summary, forClient }: { summary: { peakDeg: number | null; uncertaintyDeg: number | null; reps: number; kept: boolean } | null; forClient: boolean }) {
  if (!summary) return <p className="text-ink-soft" data-testid="clip-status">{forClient ? "Not measured yet." : "Not measured yet: open it to measure it here."}</p>;
  if (forClient) return <p className="text-ink-soft" data-testid="clip-status">Measured; your therapist reviews the result.</p>;
  const peak = summary.peakDeg === null ? "no peak found" : `peak ${summary.peakDeg.toFixed(0)}°${summary.uncertaintyDeg === null ? "" : ` ± ${summary.uncertaintyDeg.toFixed(0)}°`}`;
  return (
    <p className="text-ink-soft" data-testid="clip-status">
      Measured: {peak}, {summary.reps} repetition{summary.reps === 1 ? "" : "s"}
      {summary.kept ? "; counts towards the grade" : ""}.
    </p>
  );
}
