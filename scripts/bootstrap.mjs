#!/usr/bin/env node
// Fresh-machine set-up shared by `npm run demo`, `npm test` and `npm run bench`:
// 1. the Debian packages in scripts/system-packages.txt (installed when root, else the exact
//    apt-get line is printed and we exit 1); 2. `npm ci` when node_modules is missing or older
//    than the lockfile; 3. the compiled CLI in dist/ when older than src/.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const say = (m) => process.stderr.write(`bootstrap: ${m}\n`);

function systemPackages() {
  const list = readFileSync(join(root, 'scripts/system-packages.txt'), 'utf8')
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l && !l.startsWith('#'));
  const hasDpkg = spawnSync('dpkg-query', ['--version'], { stdio: 'ignore' }).status === 0;
  if (!hasDpkg) {
    say('not a Debian-like system: make sure cairo, pango, pkg-config and a C++ toolchain are installed');
    return;
  }
  const missing = list.filter((p) => {
    const r = spawnSync('dpkg-query', ['-W', '-f=${Status}', p], { encoding: 'utf8' });
    return r.status !== 0 || !r.stdout.includes('install ok installed');
  });
  if (missing.length === 0) return;
  const line = `apt-get update && apt-get install -y ${missing.join(' ')}`;
  if (process.getuid && process.getuid() !== 0) {
    say(`missing system packages; run as root:\n  ${line}`);
    process.exit(1);
  }
  say(`installing system packages: ${missing.join(' ')}`);
  execFileSync('sh', ['-c', `${line.replace('apt-get install', 'DEBIAN_FRONTEND=noninteractive apt-get install')}`], { stdio: 'inherit' });
}

function npmDeps() {
  const marker = join(root, 'node_modules/.package-lock.json');
  const lock = join(root, 'package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  say('installing npm dependencies (npm ci)');
  execFileSync('npm', ['ci'], { cwd: root, stdio: 'inherit' });
}

systemPackages();
npmDeps();
execFileSync(process.execPath, [join(root, 'scripts/build.mjs')], { stdio: 'inherit' });
