import { createServer } from 'node:net';
// The project's own start/stop helpers are plain JS (they run before npm install), so they carry no types.
// @ts-expect-error -- no declaration file for the .mjs script helpers
import * as lib from '../../scripts/lib/mariadb.mjs';

export interface MariadbPaths {
  dir: string;
  datadir: string;
  socket: string;
  pidFile: string;
  logFile: string;
  port: number;
}

interface MariadbLib {
  mariadbPaths(dataRoot: string, port: number): MariadbPaths;
  startMariadb(paths: MariadbPaths, opts?: { fresh?: boolean; log?: (m: string) => void }): Promise<{ pid: number; started: boolean }>;
  stopMariadb(paths: MariadbPaths): Promise<void>;
  ensureDatabase(paths: MariadbPaths, opts: { database: string; user: string; password: string; wildcard?: boolean }): void;
  runningPid(paths: MariadbPaths): number | null;
}

const typed = lib as MariadbLib;
export const { mariadbPaths, startMariadb, stopMariadb, ensureDatabase, runningPid } = typed;

/** A TCP port nobody listens on right now on 127.0.0.1, so parallel runs do not collide. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}
