"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
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
    setStatus({ kind: "sending" });
    setFieldErrors({});
    try {
      const res = await fetch("/api/v1/uploads", { method: "POST", body: data });
      const body = (await res.json().catch(() => ({}))) as { error?: string; fields?: Record<string, string> };
      if (res.ok) {
        setStatus({ kind: "done", message: res.status === 201 ? "Sent. Your therapist will see it in their list." : "Already received earlier; it is stored once." });
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
      aria-label="Send a file"
      className="grid max-w-xl gap-4"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        void submit(e.currentTarget);
      }}
    >
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
            setRecorded(file);
            setUploadUid(crypto.randomUUID());
          }}
        />
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
