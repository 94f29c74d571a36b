import { createHash } from 'node:crypto'
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'

export interface ObjectStoreSettings {
  endpoint?: string
  region: string
  bucket: string
  accessKeyId?: string
  secretAccessKey?: string
  forcePathStyle: boolean
}

export interface StoredObject {
  key: string
  size: number
  sha256: string
}

/**
 * The one module that talks to the S3-compatible object store. Every object carries its SHA-256 in
 * metadata, checked again on read, so a changed object is noticed (HIPAA 164.312(c)(2)).
 */
export class ObjectStore {
  readonly client: S3Client
  readonly bucket: string

  constructor(settings: ObjectStoreSettings) {
    this.bucket = settings.bucket
    this.client = new S3Client({
      endpoint: settings.endpoint,
      region: settings.region,
      forcePathStyle: settings.forcePathStyle,
      credentials:
        settings.accessKeyId && settings.secretAccessKey
          ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey }
          : undefined,
      // With the SDK's default checksums, streamed uploads to some S3-compatible servers are stored
      // with chunk framing inside the object (see ../shared/stack.md, "Local fakes").
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      maxAttempts: 2,
    })
  }

  async ensureBucket(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }))
    } catch (error) {
      const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode
      if (status !== 404 && (error as Error).name !== 'NotFound') throw error
      await this.client.send(new CreateBucketCommand({ Bucket: this.bucket }))
    }
  }

  async put(key: string, body: Buffer, contentType: string): Promise<StoredObject> {
    const sha256 = createHash('sha256').update(body).digest('hex')
    await this.client.send(
      new PutObjectCommand({
        Bucket: this.bucket,
        Key: key,
        Body: body,
        ContentType: contentType,
        ContentLength: body.length,
        Metadata: { sha256 },
      }),
    )
    return { key, size: body.length, sha256 }
  }

  /** Reads an object and refuses it when its content no longer matches the recorded SHA-256. */
  /**
   * Stores a file, then runs `save` (the database rows that refer to it). If `save` fails the file is
   * deleted again, so a failed request leaves no orphan object.
   */
  async putThen<T>(key: string, body: Buffer, contentType: string, save: (stored: StoredObject) => Promise<T>): Promise<T> {
    const stored = await this.put(key, body, contentType)
    try {
      return await save(stored)
    } catch (error) {
      await this.delete(key).catch(() => {})
      throw error
    }
  }

  async get(key: string, expectedSha256?: string): Promise<Buffer> {
    const result = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }))
    const body = Buffer.from(await result.Body!.transformToByteArray())
    const sha256 = createHash('sha256').update(body).digest('hex')
    const expected = expectedSha256 ?? result.Metadata?.sha256
    if (expected && expected !== sha256) throw new Error(`object ${key} failed its SHA-256 check`)
    return body
  }

  async head(key: string): Promise<{ size: number; sha256: string | null } | null> {
    try {
      const result = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }))
      return { size: result.ContentLength ?? 0, sha256: result.Metadata?.sha256 ?? null }
    } catch (error) {
      if ((error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null
      throw error
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }))
  }

  /** For the health check: can we reach the bucket? */
  async ping(): Promise<void> {
    await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }))
  }
}
