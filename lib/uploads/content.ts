import { fileTypeFromBuffer } from "file-type";
import type { UploadKind } from "@/db/schema";

const MB = 1024 * 1024;

/**
 * What each kind of upload may be, decided from the file's content (its magic bytes, read by the `file-type` package),
 * never from its name or the type the browser claims. A 60-second phone clip at 720p is about 10-30 MB; 50 MB leaves
 * room without letting one upload fill a clinic's storage. [common practice]
 */
export const UPLOAD_RULES: Record<UploadKind, { maxBytes: number; types: Record<string, string>; expected: string }> = {
  clip: {
    maxBytes: 50 * MB,
    types: { "video/webm": "webm", "video/mp4": "mp4" },
    expected: "a WebM or MP4 video",
  },
  document: {
    maxBytes: 15 * MB,
    types: { "application/pdf": "pdf", "image/jpeg": "jpg", "image/png": "png", "image/webp": "webp", "image/heic": "heic" },
    expected: "a PDF, JPEG, PNG, WebP or HEIC file",
  },
};

/** Larger than the largest kind's limit plus the multipart envelope: anything bigger is refused before it is read. */
export const UPLOAD_BODY_LIMIT_BYTES = UPLOAD_RULES.clip.maxBytes + 256 * 1024;

export function describeLimit(kind: UploadKind): string {
  return `${Math.round(UPLOAD_RULES[kind].maxBytes / MB)} MB`;
}

export class RefusedUpload extends Error {
  constructor(
    public readonly status: 400 | 413 | 415,
    message: string,
  ) {
    super(message);
  }
}

/** Names a detected type in words a person knows ("a PDF document"), for refusal messages. */
function spokenType(mime: string | undefined): string {
  if (!mime) return "not a kind of file Kinarc recognises";
  if (mime === "application/pdf") return "a PDF document";
  if (mime.startsWith("image/")) return `an image (${mime.slice(6).toUpperCase()})`;
  if (mime.startsWith("video/")) return `a video of another format (${mime.slice(6)})`;
  if (mime.startsWith("audio/")) return `a sound file (${mime.slice(6)})`;
  return `of type ${mime}`;
}

export interface InspectedContent {
  mediaType: string;
  extension: string;
}

/** Checks size and content; the message of a refusal says what the file really is and what is expected. */
export async function inspectUpload(kind: UploadKind, bytes: Uint8Array, originalName: string): Promise<InspectedContent> {
  const rule = UPLOAD_RULES[kind];
  if (bytes.byteLength === 0) throw new RefusedUpload(400, `"${originalName}" is empty: expected ${rule.expected}.`);
  if (bytes.byteLength > rule.maxBytes) {
    throw new RefusedUpload(413, `"${originalName}" is ${(bytes.byteLength / MB).toFixed(1)} MB: the limit for a ${kind} is ${describeLimit(kind)}.`);
  }
  const found = await fileTypeFromBuffer(bytes);
  const extension = found ? rule.types[found.mime] : undefined;
  if (!found || !extension) {
    throw new RefusedUpload(415, `"${originalName}" was refused: its content is ${spokenType(found?.mime)}, whatever its name says. Expected ${rule.expected}.`);
  }
  return { mediaType: found.mime, extension };
}
