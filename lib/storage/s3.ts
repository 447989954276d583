import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, NoSuchKey, NotFound, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { assertStorageKey, MissingBlob, type BlobStore } from "./blob-store";

export interface S3StoreOptions {
  bucket: string;
  region: string;
  /** Set for S3-compatible services other than AWS (and the local stand-in); path-style addressing is used then. */
  endpoint?: string;
  accessKeyId: string;
  secretAccessKey: string;
}

/** An S3-compatible bucket through the AWS SDK. A PUT is atomic on S3, so a dropped upload leaves no partial object. */
export class S3Store implements BlobStore {
  readonly driver = "s3" as const;
  private readonly client: S3Client;

  constructor(private readonly opts: S3StoreOptions) {
    this.client = new S3Client({
      region: opts.region,
      endpoint: opts.endpoint,
      forcePathStyle: Boolean(opts.endpoint),
      // Many S3-compatible services (and the local stand-in) do not know the SDK's newer default checksums.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey },
    });
  }

  async put(key: string, body: Uint8Array, contentType: string): Promise<void> {
    assertStorageKey(key);
    await this.client.send(new PutObjectCommand({ Bucket: this.opts.bucket, Key: key, Body: body, ContentType: contentType }));
  }

  async get(key: string): Promise<Buffer> {
    assertStorageKey(key);
    try {
      const res = await this.client.send(new GetObjectCommand({ Bucket: this.opts.bucket, Key: key }));
      return Buffer.from(await res.Body!.transformToByteArray());
    } catch (error) {
      if (error instanceof NoSuchKey || error instanceof NotFound) throw new MissingBlob(key);
      throw error;
    }
  }

  async exists(key: string): Promise<boolean> {
    assertStorageKey(key);
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.opts.bucket, Key: key }));
      return true;
    } catch (error) {
      if (error instanceof NotFound || (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return false;
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    assertStorageKey(key);
    await this.client.send(new DeleteObjectCommand({ Bucket: this.opts.bucket, Key: key }));
  }

  destroy(): void {
    this.client.destroy();
  }
}
