/**
 * The S3 fake of the integration tier: s3rver in the global-setup process, on a free
 * loopback port, with its data in a fresh temp folder removed afterwards. The bucket is
 * created by the app at start, as in production.
 */
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { AddressInfo } from 'node:net'
// @ts-expect-error s3rver ships no type declarations
import S3rver from 's3rver'

export interface StorageFake {
  env: Record<'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY', string>
  close(): Promise<void>
}

export async function startStorageFake(): Promise<StorageFake> {
  const directory = mkdtempSync(join(tmpdir(), 'bitslack-s3-'))
  const server = new S3rver({ address: '127.0.0.1', port: 0, directory, silent: true })
  const address = (await server.run()) as AddressInfo
  return {
    env: {
      S3_ENDPOINT: `http://127.0.0.1:${address.port}`,
      S3_BUCKET: 'bitslack-test',
      S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: 'S3RVER',
      S3_SECRET_ACCESS_KEY: 'S3RVER',
    },
    async close() {
      await server.close()
      rmSync(directory, { recursive: true, force: true })
    },
  }
}
