import { describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';

function capture(): CliIo & { stderr: string[]; stdout: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

describe('kinespec serve', () => {
  it('refuses a port that is not one, in one line with exit code 2', async () => {
    const io = capture();
    expect(await main(['serve', '--port', 'eighty'], io)).toBe(2);
    expect(io.stderr).toEqual(['kinespec serve: --port (eighty) must be a whole number from 0 to 65535']);
  });

  it('refuses an unknown flag', async () => {
    const io = capture();
    expect(await main(['serve', '--colour', 'blue'], io)).toBe(2);
    expect(io.stderr[0]).toMatch(/^kinespec serve: Unknown option '--colour'/);
  });

  it('prints its usage with the environment variables pointer', async () => {
    const io = capture();
    expect(await main(['serve', '--help'], io)).toBe(0);
    expect(io.stdout[0]).toMatch(/kinespec serve \[--port 8080\] \[--host 127\.0\.0\.1\]/);
  });
});
