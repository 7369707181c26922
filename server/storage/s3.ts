/**
 * The server's object storage: one S3 client built from the environment, and the few
 * operations the app needs. Keys are always chosen by the server (`newObjectKey`), never
 * taken from a client's file name. In development, the demo and tests the endpoint is a
 * local s3rver on loopback (scripts/fakes.sh, tests/setup/server.ts).
 */
import { randomUUID } from 'node:crypto'
import type { Readable } from 'node:stream'
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'

export interface StorageSettings {
  endpoint: string
  bucket: string
  accessKeyId: string
  secretAccessKey: string
  region: string
}

/** Settings from S3_ENDPOINT, S3_BUCKET, S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY, S3_REGION (default us-east-1). */
export function storageSettings(env: NodeJS.ProcessEnv = process.env): StorageSettings {
  const missing = ['S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY'].filter((k) => !env[k])
  if (missing.length) throw new Error(`object storage is not configured: set ${missing.join(', ')}`)
  return {
    endpoint: env.S3_ENDPOINT!,
    bucket: env.S3_BUCKET!,
    accessKeyId: env.S3_ACCESS_KEY_ID!,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY!,
    region: env.S3_REGION || 'us-east-1',
  }
}

export function createS3Client(s: StorageSettings): S3Client {
  return new S3Client({
    endpoint: s.endpoint,
    region: s.region,
    credentials: { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey },
    // path-style URLs: local fakes and most self-hosted stores have no per-bucket DNS
    forcePathStyle: true,
    // without these, 3.1175 frames streamed uploads in aws-chunked encoding, which some
    // S3-compatible stores save verbatim (a corrupted object); see the stack notes
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  })
}

export class ObjectStorage {
  readonly bucket: string
  constructor(
    readonly client: S3Client,
    settings: StorageSettings,
  ) {
    this.bucket = settings.bucket
  }

  /** Create the bucket unless it exists (called at start). */
  async ensureBucket(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }))
    } catch {
      await this.client.send(new CreateBucketCommand({ Bucket: this.bucket }))
    }
  }

  async put(key: string, body: Uint8Array, contentType: string): Promise<void> {
    await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length }))
  }

  /** The object's bytes as a Node stream, with its size. */
  async stream(key: string): Promise<{ body: Readable; size: number }> {
    const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }))
    if (!res.Body) throw new Error(`object ${key} has no body`)
    return { body: res.Body as Readable, size: Number(res.ContentLength ?? 0) }
  }

  async exists(key: string): Promise<boolean> {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }))
      return true
    } catch (err) {
      const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode
      if (status === 404) return false
      throw err
    }
  }

  /** Delete an object; deleting a missing key is not an error (S3 semantics). */
  async remove(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }))
  }

  /** Keys under a prefix (at most 1000; for checks and clean-up). */
  async list(prefix: string): Promise<string[]> {
    const res = await this.client.send(new ListObjectsV2Command({ Bucket: this.bucket, Prefix: prefix }))
    return (res.Contents ?? []).map((o) => o.Key!).filter(Boolean)
  }
}

/** A fresh server-chosen key: `<kind>/<team>/<uuid>`. */
export function newObjectKey(kind: 'captures' | 'datasheets', teamId: number): string {
  return `${kind}/${teamId}/${randomUUID()}`
}

let storage: ObjectStorage | undefined

/** The process's storage (built from the environment on first use). */
export function useStorage(): ObjectStorage {
  if (!storage) {
    const s = storageSettings()
    storage = new ObjectStorage(createS3Client(s), s)
  }
  return storage
}
