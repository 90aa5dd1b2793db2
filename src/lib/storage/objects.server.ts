// Photos, documents and generated records are kept as objects through the S3 API: the local fake
// server (s3rver) in development and tests, a real bucket in production, chosen only by S3_* settings.
import { GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { env } from '../server/env';

let client: S3Client | undefined;

function s3(): S3Client {
  const e = env();
  client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
    // Bucket in the path, not the host name: s3rver (and most S3-compatible stores) expect it.
    forcePathStyle: true,
    // The SDK's default checksums frame streamed bodies; s3rver would store the framing.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  return client;
}

/** Stores bytes under `key` (keys start with the company id, so one company's objects never mix with another's). */
export async function putObject(key: string, body: Buffer, contentType: string): Promise<void> {
  await s3().send(
    new PutObjectCommand({
      Bucket: env().S3_BUCKET,
      Key: key,
      Body: body,
      ContentType: contentType,
      ContentLength: body.length,
    }),
  );
}

/** The bytes under `key`, or null when there is no such object. */
export async function getObject(key: string): Promise<Buffer | null> {
  try {
    const res = await s3().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
    if (!res.Body) return null;
    return Buffer.from(await res.Body.transformToByteArray());
  } catch (err) {
    if (err instanceof NoSuchKey || (err as { name?: string }).name === 'NoSuchKey') return null;
    throw new Error(`Could not read object ${key} from storage.`, { cause: err });
  }
}
