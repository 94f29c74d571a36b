import { mkdirSync } from 'node:fs'
import S3rver from 's3rver'

export interface FakeS3 {
  endpoint: string
  accessKeyId: string
  secretAccessKey: string
  close(): Promise<void>
}

/** A local S3-compatible server (s3rver) on 127.0.0.1, keeping files in `directory`. Development and tests only. */
export async function startFakeS3(directory: string, bucket: string, port = 0): Promise<FakeS3> {
  mkdirSync(directory, { recursive: true })
  const server = new S3rver({
    address: '127.0.0.1',
    port,
    silent: true,
    directory,
    configureBuckets: [{ name: bucket, configs: [] }],
  })
  const address = await server.run()
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    close: () => server.close(),
  }
}
