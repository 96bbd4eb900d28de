import { execFileSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/*
 * A PostgreSQL cluster of a test's own, in a temporary directory on its own port, for tests that stop and
 * start the database under a running service. The machine's own PostgreSQL (5432) is never touched.
 * Needs the server binaries (Debian's postgresql package: /usr/lib/postgresql/<major>/bin). initdb refuses
 * to run as root, so as root the cluster belongs to the `postgres` user (runuser).
 */

export interface PgCluster {
  url: string;
  port: number;
  stop(mode?: 'fast' | 'immediate'): void;
  start(): void;
  /** Stops the cluster and removes its directory. */
  destroy(): void;
}

/** The bin directory of the newest installed PostgreSQL server, or null. */
export function postgresBinDir(): string | null {
  for (const major of [17, 16, 15, 14, 13]) {
    const dir = `/usr/lib/postgresql/${major}/bin`;
    if (existsSync(join(dir, 'pg_ctl')) && existsSync(join(dir, 'initdb'))) return dir;
  }
  return null;
}

const asRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function run(bin: string, args: string[]): void {
  if (asRoot) execFileSync('runuser', ['-u', 'postgres', '--', bin, ...args], { stdio: 'pipe' });
  else execFileSync(bin, args, { stdio: 'pipe' });
}

/** Creates and starts a cluster on `port` (trust auth on loopback, user postgres, database postgres). */
export function startPgCluster(port: number): PgCluster {
  const bin = postgresBinDir();
  if (!bin) throw new Error('no PostgreSQL server binaries under /usr/lib/postgresql');
  const dir = mkdtempSync(join(tmpdir(), 'kinespec-pg-'));
  chmodSync(dir, 0o777);
  const data = join(dir, 'data');
  if (asRoot) execFileSync('chown', ['postgres', dir]);
  run(join(bin, 'initdb'), ['-D', data, '-U', 'postgres', '-A', 'trust', '--no-sync', '-E', 'UTF8']);
  const options = `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=200 -c shared_buffers=64MB`;
  const ctl = (args: string[]) => run(join(bin, 'pg_ctl'), ['-D', data, ...args]);
  const start = () => ctl(['-o', options, '-l', join(dir, 'log'), '-w', '-t', '30', 'start']);
  start();
  return {
    port,
    url: `postgres://postgres@127.0.0.1:${port}/postgres`,
    stop: (mode = 'fast') => ctl(['-m', mode, '-w', 'stop']),
    start,
    destroy() {
      try {
        ctl(['-m', 'immediate', '-w', 'stop']);
      } catch {
        // already stopped
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
