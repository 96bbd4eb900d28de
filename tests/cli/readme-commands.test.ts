import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// Every `npx kinespec` command in a ```sh block of README.md runs verbatim on a fresh clone: with the files the
// repository ships and the built launcher (npm ci builds it), each exits 0 and prints something. A README example
// that names a file the repository does not have fails here.

const root = fileURLToPath(new URL('../../', import.meta.url));
const bin = join(root, 'services/cli/bin/kinespec.js');
const built = existsSync(join(root, 'services/cli/dist/main.js'));
const readme = readFileSync(join(root, 'README.md'), 'utf8');

/** The commands of the README's sh blocks: continuation lines joined, comments cut. */
export function readmeCommands(text: string): string[] {
  const commands: string[] = [];
  for (const block of text.matchAll(/```sh\n([\s\S]*?)```/g)) {
    const joined = block[1]!.replace(/\\\n\s*/g, ' ');
    for (const line of joined.split('\n')) {
      const command = line.replace(/\s+#.*$/, '').trim();
      if (command.startsWith('npx kinespec ')) commands.push(command);
    }
  }
  return commands;
}

/** Words of a command as a shell splits them (the README's commands use no quotes or variables). */
function words(command: string): string[] {
  expect(command, 'README commands are run without a shell: no quotes, variables or pipes').not.toMatch(/['"$|;&<>`]/);
  return command.split(/\s+/).slice(2);
}

describe('README commands', () => {
  const commands = readmeCommands(readme);

  it('finds the commands the README shows, among them every verb a field engineer starts with', () => {
    for (const verb of ['check', 'frequencies', 'spectrum', 'signature', 'diagnose', 'orders']) {
      expect(commands.some((c) => c.startsWith(`npx kinespec ${verb} `)), verb).toBe(true);
    }
  });

  for (const command of commands) {
    it(`runs: ${command}`, (ctx) => {
      ctx.skip(!built, 'services/cli/dist/main.js is missing: run `npm run build` (npm ci does it)');
      const args = words(command);
      // every file the command names is in the repository
      for (const arg of args.filter((a) => /\.(wav|csv|json|ya?ml)$/.test(a))) expect(existsSync(join(root, arg)), arg).toBe(true);
      const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: 'utf8', timeout: 120_000 });
      expect(r.stderr, command).toBe('');
      expect(r.status, command).toBe(0);
      expect(r.stdout.trim().length).toBeGreaterThan(0);
    }, 130_000);
  }
});
