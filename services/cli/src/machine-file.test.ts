import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CliError } from './cli-error.js';
import { machineFileArgument, readMachineFile } from './machine-file.js';

const dir = mkdtempSync(join(tmpdir(), 'kinespec-machine-file-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('machineFileArgument', () => {
  it('wants exactly one file', () => {
    expect(machineFileArgument(['m.json'], 'u')).toBe('m.json');
    expect(() => machineFileArgument([], 'kinespec check <machine.json>')).toThrow(new CliError('missing the machine model file (usage: kinespec check <machine.json>)'));
    expect(() => machineFileArgument(['m.json', 'n.json'], 'u')).toThrow(new CliError("unexpected argument 'n.json'"));
  });
});

describe('readMachineFile', () => {
  it('says why a file cannot be read, in the words the recording verbs use', () => {
    expect(() => readMachineFile(join(dir, 'none.json'))).toThrow(new CliError(`cannot read machine model '${join(dir, 'none.json')}': no such file`));
    expect(() => readMachineFile(dir)).toThrow(new CliError(`cannot read machine model '${dir}': it is a directory`));
  });
});
