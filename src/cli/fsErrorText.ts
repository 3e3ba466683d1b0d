import { statSync } from 'node:fs';
import { dirname } from 'node:path';
import { general } from '../messages.js';

/**
 * A clear line for a file-system error on a path the user gave (a file where a folder is needed,
 * a folder where a file is, no permission), or null when the error is not one of those.
 */
export function fsErrorText(err: unknown): string | null {
  const e = err as (NodeJS.ErrnoException & { dest?: string }) | null;
  if (!e || typeof e.code !== 'string') return null;
  // Reading a folder as a file fails without a path: say what went wrong all the same.
  if (typeof e.path !== 'string') return e.code === 'EISDIR' ? general.folderGiven() : null;
  const path = e.path;
  switch (e.code) {
    case 'ENOTDIR': {
      // The first part of the path that exists as a file is the one given wrongly.
      let p = path;
      for (let up = dirname(p); up !== p; p = up, up = dirname(p)) {
        try {
          if (statSync(up).isFile()) return general.notAFolder(up, path);
        } catch {
          // not there: keep walking up
        }
      }
      return general.notAFolder(path, path);
    }
    case 'EEXIST':
      return general.existsAsFile(e.path);
    case 'EISDIR':
      return general.isAFolder(path);
    case 'EACCES':
    case 'EPERM':
      return general.noAccess(path);
    case 'ENOENT':
      return general.noSuchPath(path);
    case 'ENOSPC':
      return general.noSpace(path);
    default:
      return null;
  }
}
