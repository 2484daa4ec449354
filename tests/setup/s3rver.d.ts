// s3rver 3 ships no types; the few members the storage test uses.
declare module 's3rver' {
  interface S3rverOptions {
    port?: number
    address?: string
    directory?: string
    silent?: boolean
    configureBuckets?: { name: string; configs: string[] }[]
  }
  export default class S3rver {
    constructor(options: S3rverOptions)
    run(): Promise<{ address: string; port: number }>
    close(): Promise<void>
  }
}
