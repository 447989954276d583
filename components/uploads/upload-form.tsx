"use client";

import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { deletePendingClip, listPendingClips, savePendingClip, type PendingClip } from "@/lib/uploads/pending-clips";
import { Button } from "@/components/ui/button";
import { SelectField, TextArea } from "@/components/ui/field";
import { MOTIONS, type MotionId } from "@/lib/motions/catalog";
import { clipTarget, type ClipTarget } from "@/lib/uploads/clip-target";
import { CLIP_NEUTRAL } from "@/vision/live/clip-capture";
import { ClipAnalyzer, type ClipToAnalyze } from "./clip-analyzer";
import { ClipRecorder } from "./clip-recorder";

export interface UploadFormProps {
  /** A client uploads for themselves; staff choose the client. */
  clientId?: string;
  clients?: { value: string; label: string }[];
  /** Each motion with the digits it applies to (none for the wrist) and its two test positions in words. */
  motions: { value: string; label: string; digits: readonly string[]; positions: { against_gravity: string; gravity_minimized: string } }[];
  limits: { clip: string; document: string };
  /** Staff attach documents only; clips come from clients. */
  allowClip: boolean;
}

// Called from event handlers only; a module function keeps the clock read out of the component body.
const nowMs = () => Date.now();

type Status = { kind: "idle" } | { kind: "sending" } | { kind: "error"; message: string; retry: boolean } | { kind: "done"; message: string };

/**
 * Sends one file with an upload id chosen here when the file is picked. A retry after a dropped connection or a
 * server restart sends the same id, so the server stores the file once; picking another file gets a new id.
 */
export function UploadForm({ clientId, clients, motions, limits, allowClip }: UploadFormProps) {
  const router = useRouter();
  const [kind, setKind] = useState<"clip" | "document">(allowClip ? "clip" : "document");
  const [uploadUid, setUploadUid] = useState<string>(() => crypto.randomUUID());
  const [status, setStatus] = useState<Status>({ kind: "idle" });
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const [recorded, setRecorded] = useState<File | null>(null);
  const [pending, setPending] = useState<PendingClip[]>([]);
  const [keptUid, setKeptUid] = useState<string | null>(null);
  const formRef = useRef<HTMLFormElement>(null);
  const [motion, setMotion] = useState(motions[0]?.value ?? "");
  const [analysis, setAnalysis] = useState<{ clip: ClipToAnalyze; target: ClipTarget } | null>(null);
  const motionDef = motions.find((m) => m.value === motion) ?? motions[0];

  /**
   * Right after a clip reaches the clinic, this browser measures it (the file is still here, so nothing is fetched
   * back) and sends the result through the attempt outbox. The therapist's browser can measure it later if this
   * never finishes (a closed tab).
   */
  function analyzeSent(sent: unknown, file: Blob, fields: { motion: string; side: string; digit: string; condition: string }) {
    const upload = sent as { id?: string; uploadUid?: string; clientId?: string; kind?: string; createdAt?: string; attemptId?: string | null };
    if (upload.kind !== "clip" || !upload.id || !upload.uploadUid || !upload.clientId || upload.attemptId) return;
    try {
      const target = clipTarget({ motion: fields.motion, side: fields.side, digit: fields.digit || null }, fields.condition);
      const sentAt = upload.createdAt ? Date.parse(upload.createdAt) : nowMs();
      setAnalysis({ clip: { uploadId: upload.id, uploadUid: upload.uploadUid, clientId: upload.clientId, sentAt, source: file }, target });
    } catch {
      // Without a complete target (an older kept clip) the therapist chooses it when measuring the clip.
    }
  }

  useEffect(() => {
    if (clientId) void listPendingClips(clientId).then(setPending).catch(() => setPending([]));
  }, [clientId]);

  /** Keeps the recorded clip on this device, with what the form says about it, until the server confirms it. */
  async function keepLocally(file: File, uid: string) {
    if (!clientId) return;
    const data = new FormData(formRef.current ?? undefined);
    await savePendingClip({
      uploadUid: uid,
      clientId,
      motion: String(data.get("motion") ?? ""),
      side: String(data.get("side") ?? ""),
      digit: String(data.get("digit") ?? ""),
      condition: String(data.get("condition") ?? ""),
      note: String(data.get("note") ?? ""),
      file,
      recordedAt: nowMs(),
    })
      .then(() => setKeptUid(uid))
      .catch(() => undefined);
  }

  async function sendPending(clip: PendingClip) {
    const data = new FormData();
    for (const [k, v] of Object.entries({ clientId: clip.clientId, uploadUid: clip.uploadUid, kind: "clip", motion: clip.motion, side: clip.side, digit: clip.digit ?? "", note: clip.note })) data.set(k, v);
    data.set("file", clip.file);
    setStatus({ kind: "sending" });
    try {
      const res = await fetch("/api/v1/uploads", { method: "POST", body: data });
      const body = (await res.json().catch(() => ({}))) as { error?: string };
      if (res.ok) {
        analyzeSent(body, clip.file, { motion: clip.motion, side: clip.side, digit: clip.digit ?? "", condition: clip.condition ?? "" });
        await deletePendingClip(clip.uploadUid);
        setPending((p) => p.filter((c) => c.uploadUid !== clip.uploadUid));
        setStatus({ kind: "done", message: "Sent. Your therapist will see it in their list." });
        router.refresh();
      } else setStatus({ kind: "error", message: body.error ?? `The upload was refused (${res.status}).`, retry: res.status >= 500 });
    } catch {
      setStatus({ kind: "error", message: "The connection dropped again; the clip is still kept on this device.", retry: true });
    }
  }

  async function submit(form: HTMLFormElement) {
    const data = new FormData(form);
    data.set("uploadUid", uploadUid);
    if (clientId) data.set("clientId", clientId);
    const picked = data.get("file");
    const file = picked instanceof File && picked.size > 0 ? picked : kind === "clip" ? recorded : null;
    if (!file) {
      setFieldErrors({ file: kind === "clip" ? "Record a clip or choose a file to send." : "Choose a file to send." });
      return;
    }
    data.set("file", file);
    if (file === recorded) await keepLocally(file, uploadUid);
    setStatus({ kind: "sending" });
    setFieldErrors({});
    try {
      const res = await fetch("/api/v1/uploads", { method: "POST", body: data });
      const body = (await res.json().catch(() => ({}))) as { error?: string; fields?: Record<string, string> };
      if (res.ok) {
        if (kind === "clip") analyzeSent(body, file, { motion: String(data.get("motion") ?? ""), side: String(data.get("side") ?? ""), digit: String(data.get("digit") ?? ""), condition: String(data.get("condition") ?? "") });
        setStatus({ kind: "done", message: res.status === 201 ? "Sent. Your therapist will see it in their list." : "Already received earlier; it is stored once." });
        if (file === recorded) await deletePendingClip(uploadUid).catch(() => undefined);
        form.reset();
        setRecorded(null);
        setUploadUid(crypto.randomUUID());
        router.refresh();
        return;
      }
      setFieldErrors(body.fields ?? {});
      setStatus({ kind: "error", message: body.error ?? `The upload was refused (${res.status}).`, retry: res.status >= 500 });
    } catch {
      setStatus({ kind: "error", message: "The connection dropped before the server answered. Nothing is lost: send again and it will be stored once.", retry: true });
    }
  }

  return (
    <form
      ref={formRef}
      aria-label="Send a file"
      className="grid max-w-xl gap-4"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        void submit(e.currentTarget);
      }}
    >
      {pending.map((clip) => (
        <div key={clip.uploadUid} role="status" className="rounded-lg bg-flag-amberBg px-3 py-2 text-sm" data-testid="pending-clip">
          A clip recorded {new Date(clip.recordedAt).toLocaleString()} has not reached your clinic yet; it is kept on this device.{" "}
          <Button type="button" variant="quiet" onClick={() => void sendPending(clip)}>
            Send it now
          </Button>{" "}
          <button
            type="button"
            className="text-ink-soft underline"
            onClick={() => void deletePendingClip(clip.uploadUid).then(() => setPending((p) => p.filter((c) => c.uploadUid !== clip.uploadUid)))}
          >
            Discard
          </button>
        </div>
      ))}
      {clients ? <SelectField label="Client" name="clientId" options={clients} error={fieldErrors.clientId} /> : null}
      {allowClip ? (
        <SelectField
          label="What are you sending?"
          name="kind"
          value={kind}
          onChange={(e) => setKind(e.target.value as "clip" | "document")}
          options={[
            { value: "clip", label: `A short clip of a movement (WebM or MP4, up to ${limits.clip})` },
            { value: "document", label: `A document or photo (PDF, JPEG, PNG, WebP or HEIC, up to ${limits.document})` },
          ]}
        />
      ) : (
        <input type="hidden" name="kind" value="document" />
      )}
      {kind === "clip" ? (
        <>
          <SelectField label="Movement shown" name="motion" options={motions} value={motion} onChange={(e) => setMotion(e.target.value)} error={fieldErrors.motion} />
          {motionDef && motionDef.digits.length ? (
            <SelectField
              key={motionDef.value}
              label="Finger"
              name="digit"
              options={motionDef.digits.map((d) => ({ value: d, label: d === "thumb" ? "Thumb" : `${d[0].toUpperCase()}${d.slice(1)} finger` }))}
              error={fieldErrors.digit}
            />
          ) : null}
          <SelectField
            label="Side"
            name="side"
            options={[
              { value: "right", label: "Right hand" },
              { value: "left", label: "Left hand" },
            ]}
            error={fieldErrors.side}
          />
          {motionDef ? (
            <SelectField
              key={`${motionDef.value}-position`}
              label="How your arm rested"
              name="condition"
              hint="Kinarc checks this against what the camera sees."
              options={[
                { value: "against_gravity", label: motionDef.positions.against_gravity },
                { value: "gravity_minimized", label: motionDef.positions.gravity_minimized },
              ]}
            />
          ) : null}
          {MOTIONS[motion as MotionId]?.joint === "wrist" ? (
            // The clip's still start becomes the straight-wrist reading the wrist is measured against (vision/live/clip-capture.ts).
            <p className="rounded-lg bg-tide-50 px-3 py-2 text-sm text-tide-900" data-testid="clip-neutral-instruction">
              Start the clip with {CLIP_NEUTRAL.holdMs / 1000} seconds of a straight, still wrist: forearm resting on the table, wrist in line with the
              forearm, fingers relaxed. Then make the movement without moving your forearm or the camera.
            </p>
          ) : null}
        </>
      ) : null}
      {kind === "clip" ? (
        <ClipRecorder
          onRecorded={(file) => {
            const uid = crypto.randomUUID();
            // "Record again" replaces the clip kept on this device.
            if (!file) void deletePendingClip(uploadUid).catch(() => undefined);
            setRecorded(file);
            setUploadUid(uid);
            if (file) void keepLocally(file, uid);
          }}
        />
      ) : null}
      {kind === "clip" && recorded && keptUid === uploadUid ? (
        <p className="text-xs text-ink-faint" data-testid="clip-kept">
          Kept on this device until your clinic has it.
        </p>
      ) : null}
      <div>
        <label htmlFor="upload-file" className="block text-sm font-medium text-ink">
          {kind === "clip" ? "Or choose a clip from this device" : "File"}
        </label>
        <input
          id="upload-file"
          name="file"
          type="file"
          accept={kind === "clip" ? "video/webm,video/mp4" : "application/pdf,image/jpeg,image/png,image/webp,image/heic"}
          onChange={() => setUploadUid(crypto.randomUUID())}
          aria-describedby="upload-file-hint"
          className="mt-1 block w-full text-sm"
        />
        <p id="upload-file-hint" className="mt-1 text-xs text-ink-faint">
          Kinarc checks what the file really contains, not its name. {kind === "clip" ? `Up to ${limits.clip}; about 10-60 seconds is plenty.` : `Up to ${limits.document}.`}
        </p>
        {fieldErrors.file && status.kind !== "error" ? (
          <p role="alert" className="mt-1 text-sm text-flag-rose">
            {fieldErrors.file}
          </p>
        ) : null}
      </div>
      <TextArea label="Note for your therapist (optional)" name="note" maxLength={500} error={fieldErrors.note} />
      {status.kind === "error" ? (
        <p role="alert" data-testid="upload-error" className="rounded-lg bg-flag-roseBg px-3 py-2 text-sm text-flag-rose">
          {status.message}
        </p>
      ) : null}
      {status.kind === "done" ? (
        <p role="status" className="rounded-lg bg-tide-50 px-3 py-2 text-sm text-tide-700">
          {status.message}
        </p>
      ) : null}
      {analysis ? <ClipAnalyzer clip={analysis.clip} target={analysis.target} showNumbers={false} /> : null}
      <div>
        <Button type="submit" disabled={status.kind === "sending"}>
          {status.kind === "sending" ? "Sending…" : status.kind === "error" && status.retry ? "Send again" : "Send"}
        </Button>
      </div>
    </form>
  );
}
