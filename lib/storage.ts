/**
 * Object storage (S3 API) for files later features keep beside a design (exports, reports).
 * Locally it talks to the s3rver fake; gotcha G11: path-style addressing and checksums only
 * when required, or stream uploads are stored corrupted.
 */
import { DeleteObjectCommand, GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { env } from './env';

let client: S3Client | null = null;

/** The process's S3 client, built from S3_* variables on first use. */
export function storageClient(): S3Client {
  if (!client) {
    const e = env();
    client = new S3Client({
      endpoint: e.S3_ENDPOINT,
      region: e.S3_REGION,
      credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
      forcePathStyle: true,
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }
  return client;
}

/** Store `body` under `key` in the app's bucket. */
export async function putObject(key: string, body: Uint8Array | string, contentType = 'application/octet-stream'): Promise<void> {
  await storageClient().send(new PutObjectCommand({ Bucket: env().S3_BUCKET, Key: key, Body: body, ContentType: contentType }));
}

/** The bytes stored under `key`, or null when there is no such object. */
export async function getObject(key: string): Promise<Uint8Array | null> {
  try {
    const out = await storageClient().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
    return out.Body ? await out.Body.transformToByteArray() : new Uint8Array();
  } catch (e) {
    if (e instanceof NoSuchKey || (e as { name?: string }).name === 'NoSuchKey') return null;
    throw e;
  }
}

/** Remove the object under `key` (no error when it does not exist). */
export async function deleteObject(key: string): Promise<void> {
  await storageClient().send(new DeleteObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
}
