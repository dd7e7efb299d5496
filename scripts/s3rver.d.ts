// The part of s3rver's API the local S3 fake uses (the package ships no types).
declare module 's3rver' {
  import type { AddressInfo } from 'node:net'
  export interface S3rverOptions {
    address?: string
    port?: number
    directory: string
    silent?: boolean
    resetOnClose?: boolean
    configureBuckets?: Array<{ name: string; configs?: Array<string | Buffer> }>
  }
  export default class S3rver {
    constructor(options: S3rverOptions)
    run(): Promise<AddressInfo>
    close(): Promise<void>
  }
}
