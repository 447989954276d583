/**
 * Where uploaded files live. Keys are relative paths made by Kinarc (`<clinic>/<client>/<upload>.<ext>`), never
 * taken from a caller. `put` is all-or-nothing: a reader sees either no object or the whole one.
 */
export interface BlobStore {
  readonly driver: "disk" | "s3";
  put(key: string, body: Uint8Array, contentType: string): Promise<void>;
  /** The whole object; throws `MissingBlob` when there is none. */
  get(key: string): Promise<Buffer>;
  exists(key: string): Promise<boolean>;
  /** Removes the object; removing a missing one is not an error. */
  delete(key: string): Promise<void>;
}

export class MissingBlob extends Error {
  constructor(public readonly key: string) {
    super(`No stored file under ${key}.`);
  }
}

const KEY_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]*(\/[A-Za-z0-9][A-Za-z0-9._-]*)*$/;

/** Refuses keys that could step outside the store (`..`, absolute paths, empty segments). */
export function assertStorageKey(key: string): void {
  if (!KEY_PATTERN.test(key) || key.split("/").some((segment) => segment === ".." || segment === ".")) {
    throw new Error(`Invalid storage key "${key}": expected segments of letters, digits, dot, dash and underscore`);
  }
}
