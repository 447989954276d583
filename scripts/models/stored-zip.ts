/**
 * Uncompressed ("stored") zip archives for model bundles. The tasks library reads bundle entries in place and
 * refuses deflated entries, so every entry is stored, and each entry's data starts on an aligned offset (padding
 * in an extra field, as Android's zipalign does with header ID 0xD935) so the flatbuffers inside stay aligned.
 */
import { unzipSync, zipSync } from "fflate";

export const ZIP_ALIGNMENT_EXTRA_ID = 0xd935;
const LOCAL_HEADER_BYTES = 30;
const LOCAL_HEADER_SIGNATURE = 0x04034b50;
// A fixed timestamp keeps rebuilt bundles byte-identical.
const ENTRY_MTIME = new Date(2020, 0, 1, 0, 0, 0);

export interface ZipEntryInput {
  name: string;
  data: Uint8Array;
}

export function writeStoredZip(entries: ZipEntryInput[], alignBytes = 64): Uint8Array {
  if (!Number.isInteger(alignBytes) || alignBytes < 1 || alignBytes > 0xffff) {
    throw new Error(`alignBytes: expected an integer 1-65535, got ${alignBytes}`);
  }
  const files: Record<string, [Uint8Array, { level: 0; mtime: Date; extra: Record<number, Uint8Array> }]> = {};
  let offset = 0;
  for (const { name, data } of entries) {
    if (!name || name in files) throw new Error(`entries: expected unique non-empty names, got "${name}"`);
    const nameLength = new TextEncoder().encode(name).length;
    // Extra field = 4-byte header + 2-byte alignment value + padding.
    const beforeData = offset + LOCAL_HEADER_BYTES + nameLength + 4 + 2;
    const padding = (alignBytes - (beforeData % alignBytes)) % alignBytes;
    const extra = new Uint8Array(2 + padding);
    new DataView(extra.buffer).setUint16(0, alignBytes, true);
    files[name] = [data, { level: 0, mtime: ENTRY_MTIME, extra: { [ZIP_ALIGNMENT_EXTRA_ID]: extra } }];
    offset = beforeData + padding + data.length;
  }
  return zipSync(files);
}

export interface StoredZipEntry {
  name: string;
  /** 0 = stored, 8 = deflated (APPNOTE.TXT 4.4.5). */
  compressionMethod: number;
  dataOffset: number;
  compressedSize: number;
  uncompressedSize: number;
}

/** Walks the local file headers (APPNOTE.TXT 4.3.7) to report how each entry is stored and where its data starts. */
export function listZipEntries(zip: Uint8Array): StoredZipEntry[] {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  const entries: StoredZipEntry[] = [];
  let pos = 0;
  while (pos + LOCAL_HEADER_BYTES <= zip.length && view.getUint32(pos, true) === LOCAL_HEADER_SIGNATURE) {
    const flags = view.getUint16(pos + 6, true);
    if (flags & 0x8) throw new Error("zip: entries with a trailing data descriptor are not supported");
    const compressionMethod = view.getUint16(pos + 8, true);
    const compressedSize = view.getUint32(pos + 18, true);
    const uncompressedSize = view.getUint32(pos + 22, true);
    const nameLength = view.getUint16(pos + 26, true);
    const extraLength = view.getUint16(pos + 28, true);
    const name = new TextDecoder().decode(zip.subarray(pos + LOCAL_HEADER_BYTES, pos + LOCAL_HEADER_BYTES + nameLength));
    const dataOffset = pos + LOCAL_HEADER_BYTES + nameLength + extraLength;
    entries.push({ name, compressionMethod, dataOffset, compressedSize, uncompressedSize });
    pos = dataOffset + compressedSize;
  }
  return entries;
}

export function readZip(zip: Uint8Array): Record<string, Uint8Array> {
  return unzipSync(zip);
}
