// s3rver ships no types; only what the photo-store tests use.
declare module 's3rver' {
  type Options = {
    port?: number
    address?: string
    silent?: boolean
    directory: string
    resetOnClose?: boolean
    configureBuckets?: Array<{ name: string }>
  }
  export default class S3rver {
    constructor(options: Options)
    run(): Promise<{ address: string; port: number }>
    close(): Promise<void>
  }
}
