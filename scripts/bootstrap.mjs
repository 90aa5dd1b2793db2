#!/usr/bin/env node
// First step of `npm start` and `npm test` on any machine, fresh or not. Plain Node, no
// dependencies (node_modules may not exist yet): installs npm packages when the lock file changed,
// and, as root on Debian, the system packages the product runs on. Fast when nothing is missing.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

const root = new URL('..', import.meta.url).pathname;
const forTests = process.argv.includes('--test');
const say = (msg) => console.log(`[bootstrap] ${msg}`);

function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts });
  if (r.status !== 0) {
    console.error(`[bootstrap] '${cmd} ${args.join(' ')}' failed with exit code ${r.status}.`);
    process.exit(r.status ?? 1);
  }
}

// 1. npm dependencies: reinstall when package-lock.json differs from what was installed.
const lock = join(root, 'package-lock.json');
const marker = join(root, 'node_modules', '.heatlayer-lock-hash');
const lockHash = existsSync(lock) ? createHash('sha256').update(readFileSync(lock)).digest('hex') : 'none';
if (!existsSync(marker) || readFileSync(marker, 'utf8') !== lockHash) {
  say('installing npm dependencies (first run or package-lock.json changed)…');
  run('npm', existsSync(lock) ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund']);
  writeFileSync(marker, lockHash);
}

// 2. System packages from Debian. Each entry: a file that proves it is there, and its packages.
const PG_BIN = '/usr/lib/postgresql/15/bin/postgres';
const needs = [
  { what: 'PostgreSQL 15 server', file: PG_BIN, pkgs: ['postgresql-common', 'postgresql-15'] },
  {
    what: 'pg_partman extension',
    file: '/usr/share/postgresql/15/extension/pg_partman.control',
    pkgs: ['postgresql-15-partman'],
  },
];
if (forTests) {
  needs.push({ what: 'Chromium (browser tests)', file: '/usr/bin/chromium', pkgs: ['chromium'] });
  needs.push({ what: 'Mosquitto (broker interoperability test)', file: '/usr/sbin/mosquitto', pkgs: ['mosquitto'] });
}
const missing = needs.filter((n) => !existsSync(n.file));
if (missing.length > 0) {
  const isRoot = process.getuid?.() === 0;
  const hasApt = existsSync('/usr/bin/apt-get');
  if (!isRoot || !hasApt) {
    console.error(
      `[bootstrap] Missing: ${missing.map((m) => m.what).join(', ')}.\n` +
        `Install as root: apt-get install -y ${missing.flatMap((m) => m.pkgs).join(' ')}`,
    );
    process.exit(1);
  }
  say(`installing from Debian: ${missing.map((m) => m.what).join(', ')}…`);
  const aptEnv = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  // Never let the Debian package create and start its default cluster on 5432: we run our own.
  if (!existsSync(PG_BIN)) {
    execFileSync('mkdir', ['-p', '/etc/postgresql-common/createcluster.d']);
    writeFileSync('/etc/postgresql-common/createcluster.d/heatlayer.conf', 'create_main_cluster = false\n');
  }
  run('apt-get', ['update', '-qq'], { env: aptEnv });
  run('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...new Set(missing.flatMap((m) => m.pkgs))], {
    env: aptEnv,
  });
  // Mosquitto's package starts a system broker on 1883; the tests start their own.
  if (missing.some((m) => m.pkgs.includes('mosquitto')))
    spawnSync('service', ['mosquitto', 'stop'], { stdio: 'ignore' });
}
