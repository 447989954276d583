"use client";

import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { deletePendingClip, listPendingClips, savePendingClip, type PendingClip } from "@/lib/uploads/pending-clips";
import { Button } from "@/components/ui/button";
import { SelectField, TextArea } from "@/components/ui/field";
import { ClipRecorder } from "./clip-recorder";

export interface UploadFormProps {
  /** A client uploads for themselves; staff choose the client. */
  clientId?: string;
  clients?: { value: string; label: string }[];
  motions: { value: string; label: string }[];
  limits: { clip: string; document: string };
  /** Staff attach documents only; clips come from clients. */
  allowClip: boolean;
}

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
      note: String(data.get("note") ?? ""),
      file,
      recordedAt: Date.now(),
    })
      .then(() => setKeptUid(uid))
      .catch(() => undefined);
  }

  async function sendPending(clip: PendingClip) {
    const data = new FormData();
    for (const [k, v] of Object.entries({ clientId: clip.clientId, uploadUid: clip.uploadUid, kind: "clip", motion: clip.motion, side: clip.side, note: clip.note })) data.set(k, v);
    data.set("file", clip.file);
    setStatus({ kind: "sending" });
    try {
      const res = await fetch("/api/v1/uploads", { method: "POST", body: data });
      const body = (await res.json().catch(() => ({}))) as { error?: string };
      if (res.ok) {
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
          <SelectField label="Movement shown" name="motion" options={motions} error={fieldErrors.motion} />
          <SelectField
            label="Side"
            name="side"
            options={[
              { value: "right", label: "Right hand" },
              { value: "left", label: "Left hand" },
            ]}
            error={fieldErrors.side}
          />
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
      <div>
        <Button type="submit" disabled={status.kind === "sending"}>
          {status.kind === "sending" ? "Sending…" : status.kind === "error" && status.retry ? "Send again" : "Send"}
        </Button>
      </div>
    </form>
  );
}
