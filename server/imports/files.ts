import { randomBytes } from 'node:crypto'
import { mkdirSync } from 'node:fs'
import { rm } from 'node:fs/promises'
import { join } from 'node:path'

const KEY = /^[a-f0-9]{32}$/

/** Where uploads and rejection reports live. Names are our random keys; the uploader's file name never is a path. */
export function importFiles(dataDir: string) {
  const dir = join(dataDir, 'imports')
  const checked = (key: string) => {
    if (!KEY.test(key)) throw new Error(`not an import file key: ${key}`)
    return key
  }
  return {
    dir,
    ensureDir() {
      mkdirSync(dir, { recursive: true })
      return dir
    },
    newKey: () => randomBytes(16).toString('hex'),
    upload: (key: string) => join(dir, `${checked(key)}.csv`),
    report: (key: string) => join(dir, `${checked(key)}.rejected.csv`),
    async removeUpload(key: string) {
      await rm(join(dir, `${checked(key)}.csv`), { force: true })
    },
  }
}
