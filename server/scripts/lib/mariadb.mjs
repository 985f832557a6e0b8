// Starts and stops a private MariaDB server for Ostium: its own data folder, port, socket and
// pid file inside the project, bound to 127.0.0.1 only. Plain Node (no dependencies) because it
// runs before `npm install` has finished.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

export function mariadbPaths(dataRoot, port) {
  const dir = join(dataRoot, `mariadb-${port}`);
  return {
    dir,
    datadir: join(dir, 'data'),
    socket: join(dir, 'mariadb.sock'),
    pidFile: join(dir, 'mariadb.pid'),
    logFile: join(dir, 'error.log'),
    port,
  };
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

export function runningPid(paths) {
  if (!existsSync(paths.pidFile)) return null;
  const pid = Number(readFileSync(paths.pidFile, 'utf8').trim());
  return pid && alive(pid) ? pid : null;
}

function client(paths, sql) {
  const r = spawnSync('mariadb', ['--no-defaults', '-uroot', `--socket=${paths.socket}`, '-e', sql], {
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`mariadb client failed: ${r.stderr || r.stdout}`);
  return r.stdout;
}

export async function ping(paths) {
  const r = spawnSync('mariadb-admin', ['--no-defaults', '-uroot', `--socket=${paths.socket}`, 'ping'], {
    encoding: 'utf8',
  });
  return r.status === 0;
}

/**
 * Initialises the data folder the first time and starts mariadbd unless it already runs.
 * Resolves to { pid, started } once the server answers.
 */
export async function startMariadb(paths, { fresh = false, log = console.log } = {}) {
  const existing = runningPid(paths);
  if (existing && (await ping(paths))) return { pid: existing, started: false };
  if (fresh) rmSync(paths.dir, { recursive: true, force: true });
  mkdirSync(paths.dir, { recursive: true });
  if (!existsSync(join(paths.datadir, 'mysql'))) {
    log(`initialising MariaDB data folder ${paths.datadir}`);
    const args = [
      '--no-defaults',
      `--datadir=${paths.datadir}`,
      '--auth-root-authentication-method=normal',
      '--skip-test-db',
    ];
    if (process.getuid?.() === 0) args.splice(1, 0, '--user=root');
    const r = spawnSync('mariadb-install-db', args, { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`mariadb-install-db failed:\n${r.stdout}\n${r.stderr}`);
  }
  const args = [
    '--no-defaults',
    `--datadir=${paths.datadir}`,
    '--bind-address=127.0.0.1',
    `--port=${paths.port}`,
    `--socket=${paths.socket}`,
    `--pid-file=${paths.pidFile}`,
    `--log-error=${paths.logFile}`,
    '--skip-name-resolve',
    '--innodb-buffer-pool-size=256M',
    '--max-connections=500',
    '--character-set-server=utf8mb4',
    '--collation-server=utf8mb4_unicode_ci',
  ];
  if (process.getuid?.() === 0) args.splice(1, 0, '--user=root');
  const child = spawn('mariadbd', args, { stdio: 'ignore', detached: false });
  child.on('error', (e) => log(`mariadbd failed to start: ${e.message}`));
  for (let i = 0; i < 150; i++) {
    if (child.exitCode !== null) {
      const tail = existsSync(paths.logFile) ? readFileSync(paths.logFile, 'utf8').split('\n').slice(-15).join('\n') : '';
      throw new Error(`mariadbd exited with code ${child.exitCode}\n${tail}`);
    }
    if (await ping(paths)) return { pid: child.pid, started: true, child };
    await sleep(100);
  }
  throw new Error(`mariadbd did not answer on port ${paths.port} within 15 s (see ${paths.logFile})`);
}

/** Creates the application user and database (idempotent). */
export function ensureDatabase(paths, { database, user, password, wildcard = false }) {
  const target = wildcard ? '*.*' : `\`${database}\`.*`;
  client(
    paths,
    [
      `CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS '${user}'@'127.0.0.1' IDENTIFIED BY '${password}'`,
      `ALTER USER '${user}'@'127.0.0.1' IDENTIFIED BY '${password}'`,
      `GRANT ALL PRIVILEGES ON ${target} TO '${user}'@'127.0.0.1'`,
      'FLUSH PRIVILEGES',
    ].join(';\n'),
  );
}

export function dropDatabases(paths, prefix) {
  const out = client(paths, `SELECT schema_name FROM information_schema.schemata WHERE schema_name LIKE '${prefix}%'`);
  const names = out.split('\n').slice(1).map((s) => s.trim()).filter(Boolean);
  if (names.length) client(paths, names.map((n) => `DROP DATABASE \`${n}\``).join(';'));
}

export async function stopMariadb(paths) {
  const pid = runningPid(paths);
  if (!pid) return;
  process.kill(pid, 'SIGTERM');
  for (let i = 0; i < 200 && alive(pid); i++) await sleep(50);
}
