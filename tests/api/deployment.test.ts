import { readdirSync, readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { envVars, loadConfig } from '../../services/api/src/config.js';

// No Docker engine runs here: the compose file is checked as data (parsed with the yaml package).
const compose = parse(readFileSync('docker-compose.yml', 'utf8')) as {
  services: Record<string, { environment?: Record<string, string>; healthcheck?: { test: unknown }; depends_on?: Record<string, { condition: string }>; volumes?: string[]; build?: unknown; image?: string }>;
  volumes: Record<string, unknown>;
};
const readme = readFileSync('README.md', 'utf8');
const names = envVars.map((v) => v.name);

describe('docker-compose.yml', () => {
  it('sets on the API and the workers only variables the service reads', () => {
    for (const service of ['api', 'worker']) {
      const env = Object.keys(compose.services[service]!.environment ?? {});
      expect(env.length).toBeGreaterThan(0);
      expect(env.filter((name) => !(names as string[]).includes(name))).toEqual([]);
    }
  });

  it('scales out: two API replicas that only queue, two workers on the same database', () => {
    const { api, worker } = compose.services as Record<string, { deploy?: { replicas?: number }; command?: string[]; environment?: Record<string, string> }>;
    expect(api!.deploy?.replicas).toBe(2);
    expect(worker!.deploy?.replicas).toBe(2);
    expect(api!.environment!['KINESPEC_QUEUE_WORKERS']).toBe('0');
    expect(worker!.command).toContain('worker');
    expect(worker!.environment!['DATABASE_URL']).toBe(api!.environment!['DATABASE_URL']);
  });

  it('runs the service against the PostgreSQL container, with health checks and a named volume', () => {
    const { api, db } = compose.services;
    expect(api!.environment!['DATABASE_URL']).toMatch(/^postgres:\/\/kinespec:.*@db:5432\/kinespec$/);
    expect(api!.depends_on).toEqual({ db: { condition: 'service_healthy' } });
    expect(JSON.stringify(api!.healthcheck!.test)).toContain('/ready');
    expect(JSON.stringify(db!.healthcheck!.test)).toContain('pg_isready');
    const volume = db!.volumes![0]!.split(':')[0]!;
    expect(Object.keys(compose.volumes)).toContain(volume);
  });

  it('gives values the service accepts', () => {
    const env = { ...compose.services.api!.environment! };
    // compose fills ${...} from the shell; a placeholder stands in for them here
    for (const [k, v] of Object.entries(env)) env[k] = String(v).replace(/\$\{[^}]*\}/g, 'placeholder-value-0123456789');
    const config = loadConfig(env);
    expect([config.host, config.port, config.demo]).toEqual(['0.0.0.0', 8080, 'off']);
  });
});

describe('README environment variables', () => {
  it('documents every variable the service reads, with its default', () => {
    for (const v of envVars) {
      const row = readme.split('\n').find((line) => line.startsWith(`| \`${v.name}\` |`));
      expect(row, v.name).toBeDefined();
      expect(row).toContain(v.defaultText);
    }
  });

  it('names no variable in the service code that config.ts does not list', () => {
    const dir = 'services/api/src';
    const files = readdirSync(dir, { recursive: true }).map(String).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'));
    const text = files.map((f) => readFileSync(`${dir}/${f}`, 'utf8')).join('\n') + readFileSync('services/cli/src/verbs/serve.ts', 'utf8') + readFileSync('services/cli/src/verbs/worker.ts', 'utf8');
    const mentioned = new Set([...text.matchAll(/\b(KINESPEC_[A-Z_]+|DATABASE_URL)\b/g)].map((m) => m[1]!));
    expect([...mentioned].filter((n) => !(names as string[]).includes(n))).toEqual([]);
  });
});
