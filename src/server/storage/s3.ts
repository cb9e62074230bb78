import "server-only";
import {
  S3Client,
  PutObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  DeleteObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
} from "@aws-sdk/client-s3";
import { env } from "@/env";

// Path-style addressing and checksums only when required: the SDK's default streamed checksums
// are stored verbatim (aws-chunked framing) by the local fake. Real S3 accepts both settings.
let client: S3Client | null = null;
export function s3(): S3Client {
  client ??= new S3Client({
    region: env.S3_REGION,
    ...(env.S3_ENDPOINT ? { endpoint: env.S3_ENDPOINT, forcePathStyle: true } : {}),
    ...(env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY
      ? { credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY } }
      : {}),
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return client;
}

export async function putObject(key: string, body: Uint8Array, contentType: string, sha256Hex: string): Promise<void> {
  await s3().send(
    new PutObjectCommand({
      Bucket: env.S3_BUCKET,
      Key: key,
      Body: body,
      ContentType: contentType,
      ContentLength: body.byteLength,
      Metadata: { sha256: sha256Hex },
    }),
  );
}

export async function getObject(key: string): Promise<Uint8Array> {
  const r = await s3().send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
  if (!r.Body) throw new Error(`Object ${key} has no body.`);
  return r.Body.transformToByteArray();
}

/** The SHA-256 stored with an object (its metadata), or null when the object is not there. */
export async function headObjectSha256(key: string): Promise<string | null> {
  try {
    const r = await s3().send(new HeadObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
    return r.Metadata?.sha256 ?? "";
  } catch (e) {
    const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
    if (status === 404 || (e as { name?: string }).name === "NotFound") return null;
    throw e;
  }
}

/** Number of objects under a prefix (tests and checks; pages through the listing). */
export async function countObjects(prefix = ""): Promise<number> {
  let n = 0;
  let token: string | undefined;
  do {
    const r = await s3().send(
      new ListObjectsV2Command({ Bucket: env.S3_BUCKET, Prefix: prefix || undefined, ContinuationToken: token }),
    );
    n += r.KeyCount ?? r.Contents?.length ?? 0;
    token = r.IsTruncated ? r.NextContinuationToken : undefined;
  } while (token);
  return n;
}

export async function deleteObject(key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
}

export async function storeAnswers(): Promise<boolean> {
  try {
    await s3().send(new HeadBucketCommand({ Bucket: env.S3_BUCKET }), { abortSignal: AbortSignal.timeout(2000) });
    return true;
  } catch {
    return false;
  }
}
