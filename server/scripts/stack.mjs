#!/usr/bin/env node
// Ostium's one entry point for `npm start`, `npm run dev`, `npm test` and `npm run bench`.
// Plain Node with no dependencies: it is what installs the dependencies.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { dataRoot, devEnv, root, testEnv } from './lib/env.mjs';
import { dropDatabases, ensureDatabase, mariadbPaths, runningPid, startMariadb, stopMariadb } from './lib/mariadb.mjs';

const mode = process.argv[2] ?? 'start';
const log = (msg) => console.log(`[ostium] ${msg}`);
const children = new Set();

function fail(msg) {
  console.error(`[ostium] ${msg}`);
  for (const c of children) c.kill('SIGTERM');
  const pid = db && runningPid(db);
  if (pid) process.kill(pid, 'SIGTERM');
  process.exit(1);
}

function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts });
  if (r.status !== 0) fail(`${cmd} ${args.join(' ')} failed (exit ${r.status})`);
}

function has(bin) {
  return spawnSync('sh', ['-c', `command -v ${bin}`], { encoding: 'utf8' }).status === 0;
}

// 1. npm dependencies, when missing or older than the lock file.
function ensureNodeModules() {
  const marker = join(root, 'node_modules', '.package-lock.json');
  const lock = join(root, 'package-lock.json');
  if (existsSync(marker) && existsSync(lock) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  log('installing npm dependencies');
  run('npm', ['install', '--no-audit', '--no-fund']);
}

// 2. Debian packages (mariadb-server, chromium), installed as root, else the command is printed.
function ensureDebian(bin, pkg) {
  if (has(bin)) return;
  const cmd = `apt-get update && apt-get install -y ${pkg}`;
  if (process.getuid?.() !== 0) fail(`${bin} is missing. Install it once with:\n  sudo sh -c '${cmd}'\nthen run this again.`);
  log(`installing Debian package ${pkg}`);
  run('sh', ['-c', `DEBIAN_FRONTEND=noninteractive ${cmd}`]);
  if (!has(bin)) fail(`${pkg} installed but ${bin} is still not on PATH`);
}

function newest(dir) {
  let t = 0;
  if (!existsSync(dir)) return t;
  if (!statSync(dir).isDirectory()) return statSync(dir).mtimeMs;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    if (e.name === 'node_modules' || e.name === 'dist') continue;
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

// Builds a workspace only when its sources changed since the last build (a second start is quick).
function build(workspace, inputs) {
  const stamp = join(root, workspace, 'dist', '.built');
  const src = Math.max(...inputs.map((d) => newest(join(root, d))));
  if (existsSync(stamp) && statSync(stamp).mtimeMs >= src) return;
  log(`building ${workspace}`);
  run('npm', ['run', 'build', '-w', workspace]);
  writeFileSync(stamp, new Date().toISOString());
}

const buildSmsFake = () => build('fakes/sms', ['fakes/sms/src', 'fakes/sms/package.json', 'fakes/sms/tsconfig.json']);

function buildAll() {
  build('shared', ['shared/src', 'shared/package.json']);
  buildSmsFake();
  build('server', ['server/src', 'shared/src', 'server/package.json']);
  build('client', ['client/src', 'client/index.html', 'client/vite.config.ts', 'shared/src', 'client/package.json']);
}

function spawnChild(name, cmd, args, env, opts = {}) {
  const child = spawn(cmd, args, { cwd: root, env: { ...process.env, ...env }, stdio: opts.stdio ?? 'inherit' });
  children.add(child);
  child.on('exit', (code, signal) => {
    children.delete(child);
    if (!stopping && opts.critical) {
      log(`${name} stopped (${signal ?? code}); shutting down`);
      shutdown(1);
    }
  });
  return child;
}

let stopping = false;
let db;
async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  // Children first (the server finishes its requests and jobs while the database is still up), then MariaDB.
  const exited = [...children].filter((c) => c.exitCode === null && c.signalCode === null).map((c) => new Promise((r) => c.once('exit', r)));
  for (const c of children) c.kill('SIGTERM');
  await Promise.race([Promise.all(exited), new Promise((r) => setTimeout(r, 5_000))]);
  if (db) await stopMariadb(db);
  process.exit(code);
}
process.on('SIGINT', () => shutdown(0));
process.on('SIGTERM', () => shutdown(0));

async function startDb(env, { wildcard = false } = {}) {
  ensureDebian('mariadbd', 'mariadb-server');
  const paths = mariadbPaths(dataRoot, Number(env.DB_PORT));
  const r = await startMariadb(paths, { log });
  if (r.started) db = paths; // stopped on exit only when this run started it
  log(`MariaDB ${r.started ? 'started' : 'already running'} on 127.0.0.1:${env.DB_PORT} (data in ${paths.datadir})`);
  ensureDatabase(paths, { database: env.DB_NAME, user: env.DB_USER, password: env.DB_PASSWORD, wildcard });
  return paths;
}

async function waitForUrl(url, what, tries = 150) {
  for (let i = 0; i < tries; i++) {
    try {
      const res = await fetch(url);
      if (res.status < 500) return true;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  log(`${what} did not answer at ${url}`);
  return false;
}

async function startMail(env) {
  mkdirSync(join(dataRoot, `mail-${env.SMTP_PORT}`), { recursive: true });
  spawnChild(
    'mail inbox',
    process.execPath,
    [
      join(root, 'node_modules', 'maildev', 'dist', 'bin', 'maildev.js'),
      '--ip', '127.0.0.1', '--web-ip', '127.0.0.1',
      '--smtp', env.SMTP_PORT, '--web', env.MAIL_WEB_PORT,
      '--mail-directory', join(dataRoot, `mail-${env.SMTP_PORT}`),
      '--silent',
    ],
    {},
    { stdio: 'ignore' },
  );
  await waitForUrl(`http://127.0.0.1:${env.MAIL_WEB_PORT}/api/email`, 'the local mail inbox');
}

// The local stand-in for the text-messaging provider (fakes/sms): the app's SDK talks to it through
// TWILIO_API_BASE, and it posts status callbacks and played replies back to the app.
async function startSmsFake(env) {
  spawnChild('SMS stand-in', process.execPath, [join(root, 'fakes', 'sms', 'dist', 'main.js')], {
    SMS_FAKE_PORT: env.SMS_FAKE_PORT,
    TWILIO_ACCOUNT_SID: env.TWILIO_ACCOUNT_SID,
    TWILIO_AUTH_TOKEN: env.TWILIO_AUTH_TOKEN,
    SMS_FAKE_INBOUND_URL: env.SMS_FAKE_INBOUND_URL,
  });
  await waitForUrl(`http://127.0.0.1:${env.SMS_FAKE_PORT}/fake/info`, 'the SMS stand-in');
}

function migrateAndSeed(env) {
  run(process.execPath, ['server/dist/cli.js', 'migrate'], { env: { ...process.env, ...env } });
  run(process.execPath, ['server/dist/cli.js', 'seed', '--if-empty'], { env: { ...process.env, ...env } });
}

async function start() {
  ensureNodeModules();
  const env = devEnv();
  await startDb(env);
  buildAll();
  migrateAndSeed(env);
  await startMail(env);
  await startSmsFake(env);
  spawnChild('server', process.execPath, ['server/dist/main.js'], env, { critical: true });
  await waitForHealth(env.PORT);
  log(
    `Ostium is ready: http://127.0.0.1:${env.PORT}  (mail inbox http://127.0.0.1:${env.MAIL_WEB_PORT}/index.html, ` +
      `SMS stand-in http://127.0.0.1:${env.SMS_FAKE_PORT}/) — Ctrl-C stops everything`,
  );
}

async function waitForHealth(port) {
  for (let i = 0; i < 300; i++) {
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`);
      if (res.ok) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  log('the server did not answer its health check within 60 s');
}

async function dev() {
  ensureNodeModules();
  const env = devEnv();
  await startDb(env);
  build('shared', ['shared/src', 'shared/package.json']);
  buildSmsFake();
  build('server', ['server/src', 'shared/src', 'server/package.json']);
  migrateAndSeed(env);
  await startMail(env);
  await startSmsFake(env);
  spawnChild('shared compiler', 'npx', ['tsc', '-p', 'shared/tsconfig.json', '--watch', '--preserveWatchOutput'], env);
  spawnChild('server compiler', 'npx', ['tsc', '-p', 'server/tsconfig.build.json', '--watch', '--preserveWatchOutput'], env);
  spawnChild('server', process.execPath, ['--watch', 'server/dist/main.js'], env, { critical: true });
  spawnChild('vite', process.execPath, [join(root, 'node_modules', 'vite', 'bin', 'vite.js'), '--host', '127.0.0.1'], env, {
    critical: true,
  });
  log(`dev: http://127.0.0.1:5173 (API proxied to :3000, hot reload; mail inbox http://127.0.0.1:${env.MAIL_WEB_PORT}/index.html, SMS stand-in http://127.0.0.1:${env.SMS_FAKE_PORT}/)`);
}

function summarise(file) {
  if (!existsSync(file)) return null;
  const r = JSON.parse(readFileSync(file, 'utf8'));
  return { passed: r.numPassedTests, failed: r.numFailedTests, skipped: r.numPendingTests + (r.numTodoTests ?? 0), failedFiles: r.numFailedTestSuites ?? 0 };
}

async function test() {
  ensureNodeModules();
  ensureDebian('chromium', 'chromium');
  const env = testEnv();
  const paths = await startDb(env, { wildcard: true });
  dropDatabases(paths, 'ostium_t');
  buildAll();
  await startMail(env);
  await startSmsFake(env);
  const results = join(dataRoot, 'test-results.json');
  mkdirSync(dataRoot, { recursive: true });
  const args = [join(root, 'node_modules', 'vitest', 'vitest.mjs'), 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${results}`, ...process.argv.slice(3)];
  const r = spawnSync(process.execPath, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env, CHROMIUM_PATH: '/usr/bin/chromium' } });
  const s = summarise(results);
  // A file can fail outside its tests (a hook such as afterAll): say so, the tests' counts alone would not.
  if (s) console.log(`\nostium: ${s.passed} passed, ${s.failed} failed, ${s.skipped} skipped${s.failedFiles ? `; ${s.failedFiles} file(s) failed` : ''}`);
  await shutdown(r.status === 0 && s && s.failed === 0 ? 0 : 1);
}

async function bench() {
  ensureNodeModules();
  const env = { ...testEnv(), DB_NAME: 'ostium_bench', LOG_LEVEL: 'error' };
  const paths = await startDb(env, { wildcard: true });
  dropDatabases(paths, 'ostium_bench');
  build('shared', ['shared/src', 'shared/package.json']);
  buildSmsFake();
  build('server', ['server/src', 'shared/src', 'server/package.json']);
  const dir = join(root, 'server', 'dist', 'bench');
  const only = process.argv[3];
  for (const f of readdirSync(dir).filter((f) => f.endsWith('.bench.js')).sort()) {
    if (only && !f.includes(only)) continue;
    log(`bench ${f}`);
    run(process.execPath, [join(dir, f)], { env: { ...process.env, ...env } });
  }
  await shutdown(0);
}

async function dbOnly() {
  const env = devEnv();
  await startDb(env);
  log('MariaDB is up; Ctrl-C stops it');
  setInterval(() => {}, 1 << 30);
}

async function seed() {
  ensureNodeModules();
  const env = devEnv();
  await startDb(env);
  build('shared', ['shared/src', 'shared/package.json']);
  build('server', ['server/src', 'shared/src', 'server/package.json']);
  run(process.execPath, ['server/dist/cli.js', 'migrate'], { env: { ...process.env, ...env } });
  run(process.execPath, ['server/dist/cli.js', 'seed'], { env: { ...process.env, ...env } });
  await shutdown(0);
}

const modes = { start, dev, test, bench, db: dbOnly, seed };
if (!modes[mode]) fail(`unknown mode ${mode}; use one of ${Object.keys(modes).join(', ')}`);
modes[mode]().catch((e) => {
  console.error(e);
  shutdown(1);
});
