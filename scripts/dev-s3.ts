/**
 * `npm run dev:s3`: a local S3-compatible bucket for development, kept in <data>/s3 (or
 * FLEXSHELF_DEV_S3_DIR), on 127.0.0.1:4568 (or FLEXSHELF_DEV_S3_PORT). Prints the settings that
 * point a server at it; Ctrl-C stops it. Not for production: any request with its fixed
 * development credentials may read and write the bucket.
 */
import { mkdirSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { startFakeS3 } from './support/fake-s3'

const directory = resolve(process.env.FLEXSHELF_DEV_S3_DIR || join(process.env.FLEXSHELF_DATA || 'data', 's3'))
mkdirSync(directory, { recursive: true })
const port = Number(process.env.FLEXSHELF_DEV_S3_PORT || 4568)
const s3 = await startFakeS3({ directory, port, bucket: process.env.FLEXSHELF_S3_BUCKET || 'flexshelf-dev', silent: false })
console.log(`Local S3 bucket "${s3.bucket}" at ${s3.endpoint}, objects kept in ${directory}`)
console.log('Start the server with:')
console.log(Object.entries(s3.env).map(([k, v]) => `  ${k}=${v}`).join(' \\\n') + ' \\\n  npm run serve')
const stop = () => void s3.stop().finally(() => process.exit(0))
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
