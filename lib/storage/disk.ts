import { randomUUID } from "node:crypto";
import { mkdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import { assertStorageKey, MissingBlob, type BlobStore } from "./blob-store";

/** Files under one folder (default data/uploads). Written to a temporary name and renamed, so a crash leaves no half file. */
export class DiskStore implements BlobStore {
  readonly driver = "disk" as const;
  constructor(private readonly root: string) {}

  private file(key: string): string {
    assertStorageKey(key);
    return path.join(this.root, ...key.split("/"));
  }

  async put(key: string, body: Uint8Array): Promise<void> {
    const target = this.file(key);
    await mkdir(path.dirname(target), { recursive: true });
    const partial = `${target}.${randomUUID()}.partial`;
    try {
      await writeFile(partial, body, { flag: "wx" });
      await rename(partial, target);
    } finally {
      await rm(partial, { force: true });
    }
  }

  async get(key: string): Promise<Buffer> {
    try {
      return await readFile(this.file(key));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") throw new MissingBlob(key);
      throw error;
    }
  }

  async exists(key: string): Promise<boolean> {
    try {
      return (await stat(this.file(key))).isFile();
    } catch {
      return false;
    }
  }

  async delete(key: string): Promise<void> {
    await rm(this.file(key), { force: true });
  }
}
