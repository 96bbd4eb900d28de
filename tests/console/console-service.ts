import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, startService } from '@kinespec/api';
import { startMockApi } from './mock-api.js';

// Starts the service the browser test drives: the real Kinespec service in-process (embedded
// PGlite in a fresh temporary data directory, seeded with the demo site), serving the console
// built by the test. Two switches for quick local iterations:
//   KINESPEC_CONSOLE_TEST_DATA_DIR=<dir>  keep the seeded database there and reuse it next run
//   KINESPEC_CONSOLE_TEST_SERVICE=mock    a fixture-backed stand-in (tests/console/mock-api.ts)

export interface ConsoleService {
  kind: 'real' | 'mock';
  url: string;
  /** a key the console is opened with (the demo's engineer key when the banner printed one) */
  key: string;
  get<T>(path: string): Promise<T>;
  close(): Promise<void>;
}

const fixture = fileURLToPath(new URL('./fixtures/mock-site.json', import.meta.url));
const adminKey = 'console-browser-test-admin-key';

function withGet(kind: ConsoleService['kind'], base: string, key: string, close: () => Promise<void>): ConsoleService {
  const url = base.endsWith('/') ? base : `${base}/`;
  return {
    kind,
    url,
    key,
    async get<T>(path: string) {
      const response = await fetch(new URL(path.replace(/^\//, ''), url), { headers: { authorization: `Bearer ${key}` } });
      if (!response.ok) throw new Error(`GET ${path}: ${response.status} ${await response.text()}`);
      return (await response.json()) as T;
    },
    close,
  };
}

export async function startConsoleService(consoleDir: string): Promise<ConsoleService> {
  if (process.env.KINESPEC_CONSOLE_TEST_SERVICE === 'mock') {
    const mock = await startMockApi(fixture, consoleDir);
    return withGet('mock', mock.url, mock.key, () => mock.app.close());
  }
  const keptDir = process.env.KINESPEC_CONSOLE_TEST_DATA_DIR;
  const dataDir = keptDir ?? mkdtempSync(join(tmpdir(), 'kinespec-console-data-'));
  const banner: string[] = [];
  const config = loadConfig(
    {
      KINESPEC_DATA_DIR: dataDir,
      KINESPEC_ADMIN_KEY: adminKey,
      KINESPEC_PORT: '0',
      KINESPEC_DEMO: 'auto',
      KINESPEC_LOG_LEVEL: 'silent',
      KINESPEC_RATE_LIMIT_MAX: '0',
      KINESPEC_CONSOLE_DIR: consoleDir,
    },
    {},
  );
  const service = await startService(config, { logger: false, out: (text) => banner.push(text) });
  // the banner comes at once; the browser checks want the demo's twelve weeks in
  await service.demoSeeded;
  // the demo prints its engineer key once; a reused database prints none, and the admin key reads too
  const engineer = /engineer\s+(\S+)/.exec(banner.join('\n'))?.[1];
  return withGet('real', service.url, engineer ?? adminKey, async () => {
    await service.close();
    if (!keptDir) rmSync(dataDir, { recursive: true, force: true });
  });
}
