import { createHash, randomBytes } from "node:crypto";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DiskStore, getStorage, MissingBlob, S3Store, type BlobStore } from "@/lib/storage";
import { S3_FAKE_CREDENTIALS, startS3Fake, type S3Fake } from "../../scripts/s3-fake";

let s3: S3Fake;
let diskRoot: string;
const stores: Record<string, () => BlobStore> = {};

beforeAll(async () => {
  s3 = await startS3Fake();
  diskRoot = mkdtempSync(path.join(os.tmpdir(), "kinarc-disk-"));
  stores.disk = () => new DiskStore(diskRoot);
  stores.s3 = () => new S3Store({ bucket: s3.bucket, region: "us-east-1", endpoint: s3.endpoint, ...S3_FAKE_CREDENTIALS });
});
afterAll(async () => {
  await s3?.close();
  rmSync(diskRoot, { recursive: true, force: true });
});

describe.each(["disk", "s3"])("%s store", (driver) => {
  it("gives back exactly the bytes put, by SHA-256 (node:crypto), and forgets them on delete", async () => {
    const store = stores[driver]();
    const body = randomBytes(300_000);
    const key = `clinic-a/client-b/${driver}-upload.webm`;
    expect(await store.exists(key)).toBe(false);
    await store.put(key, body, "video/webm");
    expect(await store.exists(key)).toBe(true);
    const back = await store.get(key);
    expect(createHash("sha256").update(back).digest("hex")).toBe(createHash("sha256").update(body).digest("hex"));
    await store.put(key, Buffer.from("replaced"), "text/plain");
    expect((await store.get(key)).toString()).toBe("replaced");
    await store.delete(key);
    expect(await store.exists(key)).toBe(false);
    await expect(store.get(key)).rejects.toBeInstanceOf(MissingBlob);
    await store.delete(key);
  });

  it("refuses keys that would leave the store", async () => {
    const store = stores[driver]();
    for (const key of ["../etc/passwd", "/abs/path", "a//b", "a/../b", ""]) {
      await expect(store.put(key, Buffer.from("x"), "text/plain")).rejects.toThrow(/Invalid storage key/);
    }
  });
});

describe("the S3 store writes real objects to the bucket", () => {
  it("lists the object through a separate SDK client", async () => {
    const store = stores.s3();
    await store.put("c1/k1/listed.pdf", Buffer.from("%PDF-1.4\n"), "application/pdf");
    const client = new S3Client({ region: "us-east-1", endpoint: s3.endpoint, forcePathStyle: true, credentials: S3_FAKE_CREDENTIALS });
    const listed = await client.send(new ListObjectsV2Command({ Bucket: s3.bucket, Prefix: "c1/" }));
    expect(listed.Contents?.map((o) => o.Key)).toEqual(["c1/k1/listed.pdf"]);
    expect(listed.Contents?.[0].Size).toBe(9);
    client.destroy();
  });
});

describe("the disk store leaves no partial files behind", () => {
  it("has only whole files after many writes", async () => {
    const store = stores.disk();
    await Promise.all(Array.from({ length: 20 }, (_, i) => store.put(`p/q/same.bin`, randomBytes(10_000 + i), "application/octet-stream")));
    expect(readdirSync(path.join(diskRoot, "p/q"))).toEqual(["same.bin"]);
  });
});

describe("the store is chosen by the environment", () => {
  it("STORAGE_DRIVER=s3 with the bucket settings gives the S3 store, writing to that bucket", async () => {
    // env() is read once per process, and nothing in this file read it before.
    Object.assign(process.env, { KINARC_DEPLOYMENT: "local", STORAGE_DRIVER: "s3", S3_ENDPOINT: s3.endpoint, S3_BUCKET: s3.bucket, S3_ACCESS_KEY_ID: S3_FAKE_CREDENTIALS.accessKeyId, S3_SECRET_ACCESS_KEY: S3_FAKE_CREDENTIALS.secretAccessKey });
    const store = getStorage();
    expect(store.driver).toBe("s3");
    await store.put("env/choice/check.bin", Buffer.from("chosen by env"), "application/octet-stream");
    expect((await stores.s3().get("env/choice/check.bin")).toString()).toBe("chosen by env");
  });
});
