import { createReadStream } from 'node:fs'
import { access, mkdir, rename, rm, writeFile } from 'node:fs/promises'
import { randomUUID } from 'node:crypto'
import { dirname, join, resolve, sep } from 'node:path'
import type { Readable } from 'node:stream'
import { assertSafeKey, StoredObjectMissing, type PhotoStore } from './photo-store'

/** Files under one folder (DATA_DIR/photos by default); a write lands whole or not at all. */
export function localPhotoStore(root: string): PhotoStore {
  const base = resolve(root)
  const pathOf = (key: string) => {
    const path = resolve(join(base, assertSafeKey(key)))
    if (!path.startsWith(base + sep)) throw new Error('Refusing a storage key outside the photo folder')
    return path
  }
  return {
    kind: 'local',
    async put(key, body) {
      const path = pathOf(key)
      await mkdir(dirname(path), { recursive: true })
      const temporary = `${path}.${randomUUID()}.part`
      try {
        await writeFile(temporary, body, { flag: 'wx', mode: 0o640 })
        await rename(temporary, path)
      } catch (error) {
        await rm(temporary, { force: true })
        throw error
      }
    },
    async getStream(key) {
      const path = pathOf(key)
      if (!(await present(path))) throw new StoredObjectMissing(key)
      return createReadStream(path) as Readable
    },
    async delete(key) {
      await rm(pathOf(key), { force: true })
    },
    exists: (key) => present(pathOf(key)),
  }
}

async function present(path: string) {
  try {
    await access(path)
    return true
  } catch {
    return false
  }
}
