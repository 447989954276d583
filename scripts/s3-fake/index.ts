import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import S3rver from "s3rver";

/** s3rver's fixed development credentials (it accepts only these). */
export const S3_FAKE_CREDENTIALS = { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" } as const;

export interface S3Fake {
  endpoint: string;
  bucket: string;
  close(): Promise<void>;
}

/**
 * A local S3-compatible server (s3rver from the registry) with one bucket, in a temporary folder removed on close.
 * Port 0 picks a free port.
 */
export async function startS3Fake(opts: { port?: number; bucket?: string } = {}): Promise<S3Fake> {
  const directory = mkdtempSync(path.join(os.tmpdir(), "kinarc-s3-"));
  const bucket = opts.bucket ?? "kinarc-uploads";
  const server = new S3rver({ address: "127.0.0.1", port: opts.port ?? 0, silent: true, directory, configureBuckets: [{ name: bucket }] });
  const address = await server.run();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    bucket,
    async close() {
      await server.close();
      rmSync(directory, { recursive: true, force: true });
    },
  };
}
