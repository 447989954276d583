import Link from "next/link";
import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { Card, PageTitle } from "@/components/ui/card";
import { ClipReview } from "@/components/uploads/clip-review";
import { AccessError, currentActor } from "@/lib/auth/guard";
import { isMotionId, MOTIONS } from "@/lib/motions/catalog";
import { requireUpload, UPLOAD_REVIEW_ROLES } from "@/lib/uploads/access";
import { loadClipReview } from "@/lib/uploads/clip-review-data";

export const metadata = { title: "Review a clip" };

/** A therapist or assistant reviews one uploaded clip: its measurement, trace and hand drawing, and whether it counts. */
export default async function ClipReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor || !(UPLOAD_REVIEW_ROLES as readonly string[]).includes(actor.role)) notFound();
  const db = getDb();
  let upload;
  try {
    upload = await requireUpload(actor, id, { db, action: "upload.read" });
  } catch (error) {
    if (error instanceof AccessError) notFound();
    throw error;
  }
  if (upload.kind !== "clip" || !upload.motion || !isMotionId(upload.motion)) notFound();
  const motion = MOTIONS[upload.motion];
  const client = await getClient(db, actor.clinicId, upload.clientId);
  const { attempt, trace } = await loadClipReview(db, upload);
  const title = `${motion.label}${upload.side ? `, ${upload.side}` : ""}${upload.digit ? ` ${upload.digit}` : ""}`;
  return (
    <>
      <PageTitle
        title={`Clip: ${title}`}
        subtitle={`${client ? `${client.givenName} ${client.familyName} · ` : ""}sent ${upload.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC`}
        action={
          <Link className="text-sm text-tide-700 underline" href="/uploads">
            All clips and documents
          </Link>
        }
      />
      <div className="grid gap-6">
        {upload.note ? <p className="text-sm text-ink-soft">Client&apos;s note: “{upload.note}”</p> : null}
        <Card title="Measurement from the clip">
          <ClipReview
            upload={{
              id: upload.id,
              uploadUid: upload.uploadUid,
              clientId: upload.clientId,
              motion: upload.motion,
              side: upload.side,
              digit: upload.digit,
              createdAt: upload.createdAt.toISOString(),
              reviewedAt: upload.reviewedAt?.toISOString() ?? null,
            }}
            attempt={attempt}
            trace={trace}
            digits={motion.digits}
            positions={motion.testPosition}
          />
        </Card>
        <aside role="note" className="rounded-card border border-sand-200 bg-white p-4 text-sm">
          <p className="font-semibold">What a clip can and cannot grade</p>
          <p className="mt-1 text-ink-soft">
            A clip shows range only: it supports grades up to 3 (movement with gravity minimized and against gravity). Grades 4 and 5 need resistance,
            and 0-1 need palpation, in person. Do not test against resistance with an unhealed fracture or early after a tendon repair; follow the
            referring surgeon&apos;s protocol and your licensed practice.
          </p>
        </aside>
      </div>
    </>
  );
}
