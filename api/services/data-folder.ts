/**
 * The data folder holds the only copy of the database, the uploads and the development
 * signing secret: only the server's own user may read it. Folders 0700, files 0600, for a
 * folder made now and for one an older version left readable to every local user (0755
 * folders, a 0644 database). Run at start-up, before the database is opened.
 */
import { chmodSync, existsSync, mkdirSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import type { Config } from '../config'

const PRIVATE_FOLDER_MODE = 0o700
const PRIVATE_FILE_MODE = 0o600

/** The database file and the files SQLite keeps beside it. */
const databaseFiles = (databaseFile: string) => [databaseFile, `${databaseFile}-wal`, `${databaseFile}-shm`, `${databaseFile}-journal`]

/** Makes the folders if missing, then tightens every folder and file the server keeps there. */
export function secureDataFolder(config: Pick<Config, 'dataDir' | 'uploadsDir' | 'databaseFile'>): void {
  for (const dir of [config.dataDir, config.uploadsDir]) {
    mkdirSync(dir, { recursive: true, mode: PRIVATE_FOLDER_MODE })
    chmodSync(dir, PRIVATE_FOLDER_MODE)
  }
  for (const file of databaseFiles(config.databaseFile)) if (existsSync(file)) chmodSync(file, PRIVATE_FILE_MODE)
  // an iterative walk: uploads nest a folder or two deep
  const folders = [config.uploadsDir]
  while (folders.length) {
    const dir = folders.pop()!
    for (const item of readdirSync(dir, { withFileTypes: true })) {
      const path = join(dir, item.name)
      if (item.isDirectory()) {
        chmodSync(path, PRIVATE_FOLDER_MODE)
        folders.push(path)
      } else if (item.isFile()) chmodSync(path, PRIVATE_FILE_MODE)
    }
  }
}
