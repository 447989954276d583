import { env } from "@/lib/env";
import { DiskStore } from "./disk";
import { S3Store } from "./s3";
import type { BlobStore } from "./blob-store";

export { assertStorageKey, MissingBlob, type BlobStore } from "./blob-store";

const globalForStore = globalThis as unknown as { kinarcStore?: BlobStore };

/** The store chosen by STORAGE_DRIVER: the local disk under UPLOADS_DIR (default) or an S3-compatible bucket. */
export function getStorage(): BlobStore {
  if (!globalForStore.kinarcStore) {
    const e = env();
    globalForStore.kinarcStore =
      e.STORAGE_DRIVER === "s3"
        ? new S3Store({
            bucket: e.S3_BUCKET!,
            region: e.S3_REGION,
            endpoint: e.S3_ENDPOINT,
            accessKeyId: e.S3_ACCESS_KEY_ID!,
            secretAccessKey: e.S3_SECRET_ACCESS_KEY!,
          })
        : new DiskStore(e.UPLOADS_DIR);
  }
  return globalForStore.kinarcStore;
}

export { DiskStore, S3Store };
