/**
 * A local S3-compatible service (s3rver) on loopback with one bucket, for development
 * (npm run dev:s3) and the tests. It keeps objects as files in `directory` and accepts its
 * fixed development credentials (s3rver's own defaults, S3RVER / S3RVER).
 */
import S3rver from 's3rver'

const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }

export interface FakeS3 {
  endpoint: string
  bucket: string
  /** The FLEXSHELF_S3_* settings that point a server at this bucket. */
  env: Record<string, string>
  stop(): Promise<void>
}

export async function startFakeS3(options: { directory: string; bucket?: string; port?: number; silent?: boolean }): Promise<FakeS3> {
  const bucket = options.bucket ?? 'flexshelf-dev'
  const server = new S3rver({
    address: '127.0.0.1',
    port: options.port ?? 0,
    directory: options.directory,
    silent: options.silent ?? true,
    configureBuckets: [{ name: bucket }],
  })
  const address = await server.run()
  const endpoint = `http://127.0.0.1:${address.port}`
  return {
    endpoint,
    bucket,
    env: {
      FLEXSHELF_S3_BUCKET: bucket,
      FLEXSHELF_S3_ENDPOINT: endpoint,
      FLEXSHELF_S3_REGION: 'us-east-1',
      FLEXSHELF_S3_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
      FLEXSHELF_S3_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
      FLEXSHELF_S3_FORCE_PATH_STYLE: 'true',
    },
    stop: () => server.close(),
  }
}
