// Plain Node on purpose: it runs before any npm package is installed. It installs what is
// missing (npm packages, Debian's MariaDB server, Chromium and poppler-utils when root; redis-server and
// haproxy for several server processes and their tests), then hands over to
// the TypeScript task runner in scripts/tasks.ts.
import { spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const task = process.argv[2] ?? 'start';
const run = (cmd, args, opts = {}) => spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts });
const has = (cmd) => spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function npmPackagesStale() {
  const marker = join(root, 'node_modules', '.package-lock.json');
  if (!existsSync(marker)) return true;
  return statSync(join(root, 'package-lock.json')).mtimeMs > statSync(marker).mtimeMs;
}

function aptInstall(packages, why) {
  if (!isRoot) {
    console.error(`Brimstock needs ${why}. Install it with: sudo apt-get install -y ${packages.join(' ')}`);
    process.exit(1);
  }
  console.log(`Installing ${packages.join(', ')} from Debian's packages (${why})…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (run('apt-get', ['update', '-qq'], { env }).status !== 0) process.exit(1);
  if (run('apt-get', ['install', '-y', '-qq', ...packages], { env }).status !== 0) process.exit(1);
}

if (npmPackagesStale()) {
  console.log('Installing npm packages (npm ci)…');
  if (run('npm', ['ci', '--no-audit', '--no-fund']).status !== 0) process.exit(1);
}
const needed = [];
if (!has('mariadbd') && !existsSync('/usr/sbin/mariadbd')) needed.push('mariadb-server');
if ((task === 'test' || task === 'bench') && !existsSync('/usr/bin/chromium')) needed.push('chromium');
// The label tests render PDFs with pdftoppm and read them back with pdftotext.
if (task === 'test' && !has('pdftoppm')) needed.push('poppler-utils');
// Several server processes (`npm run start:cluster`, SERVERS=N npm start) share a Redis behind haproxy; the tests start both.
if (task === 'test' || task === 'start:cluster' || (task === 'start' && Number(process.env.SERVERS ?? 1) > 1) || (task === 'bench' && process.argv.includes('board-cluster'))) {
  if (!existsSync('/usr/bin/redis-server')) needed.push('redis-server');
  if (!existsSync('/usr/sbin/haproxy')) needed.push('haproxy');
}
const WHY = { 'mariadb-server': 'a MariaDB server', chromium: 'a browser for tests', 'poppler-utils': 'PDF tools for tests', 'redis-server': 'Redis for several server processes', haproxy: 'a load balancer for several server processes' };
if (needed.length) aptInstall(needed, needed.map((p) => WHY[p]).join(', '));

const result = run(process.execPath, ['--import', 'tsx', join(root, 'scripts', 'tasks.ts'), task, ...process.argv.slice(3)]);
process.exit(result.status ?? 1);
