import {
  componentLines,
  flagLines,
  speedRangeRpm,
  shaftSpeeds,
  type ComponentLine,
  type FlaggedLine,
  type MachineModel,
} from '@kinespec/kinematics';
import { CliError } from '../cli-error.js';
import { parseFlags, positiveNumber, wholeNumber } from '../flags.js';
import { loadMachineFile, machineFileArgument } from '../machine-file.js';
import { alignColumns } from '../text-table.js';
import type { Verb } from '../verb.js';

/** The one-line usage that error messages end with; `--help` prints the full one. */
const SHORT_USAGE = 'kinespec frequencies <machine.json>';

function fixed(x: number, digits: number): string {
  return x.toFixed(digits);
}

function componentTitle(model: MachineModel, line: ComponentLine): string {
  const kind = line.componentKind === 'gear-mesh' ? 'gear mesh' : line.componentKind;
  const where =
    line.componentKind === 'gear-mesh'
      ? (() => {
          const m = model.gearMeshes.find((g) => g.id === line.component)!;
          return `, ${m.driver.gear} ${m.driver.teeth}T on ${m.driver.shaft} / ${m.driven.gear} ${m.driven.teeth}T on ${m.driven.shaft}`;
        })()
      : line.componentKind === 'bearing' || line.componentKind === 'rotor'
        ? `, on ${line.shaft}`
        : '';
  return `${line.component} (${kind}${where})`;
}

function flagText(line: ComponentLine | FlaggedLine): string {
  if (!('aboveNyquist' in line)) return '';
  const flags: string[] = [];
  if (line.aboveNyquist) flags.push('above Nyquist');
  if (line.ambiguous) flags.push(`within resolution of ${line.ambiguousWith.join(', ')}`);
  return flags.join('; ');
}

export const frequenciesVerb: Verb = {
  name: 'frequencies',
  summary: "Every shaft's speed and every component line (shaft harmonics, mesh, bearing, blade, belt, electrical) of a machine model",
  usage: [
    'kinespec frequencies <machine.json|yaml> [--speed-rpm N] [--json]',
    '                     [--harmonics N] [--sidebands N] [--sample-rate-hz F --resolution-hz R]',
    '',
    '  --speed-rpm N        speed of the reference shaft (default: the model\'s nominalRpm)',
    '  --harmonics N        highest shaft harmonic (default 5)',
    '  --sidebands N        mesh sidebands on each side of each mesh harmonic (default 3)',
    '  --sample-rate-hz F   with --resolution-hz: flag lines above Nyquist or closer than the resolution',
    '  --resolution-hz R    to a line of another component, for a recording with these settings',
    '  --json               { shafts: [...], lines: [...] }',
  ].join('\n'),
  async run(args, io) {
    const { values: v, positionals } = parseFlags(
      args,
      {
        'speed-rpm': { type: 'string' },
        json: { type: 'boolean', default: false },
        harmonics: { type: 'string' },
        sidebands: { type: 'string' },
        'sample-rate-hz': { type: 'string' },
        'resolution-hz': { type: 'string' },
      },
      SHORT_USAGE,
    );
    const path = machineFileArgument(positionals, SHORT_USAGE);
    const speedRpmFlag = positiveNumber('speed-rpm', v['speed-rpm']);
    const harmonics = wholeNumber('harmonics', v.harmonics, 0);
    const sidebands = wholeNumber('sidebands', v.sidebands, 0);
    const sampleRateHz = positiveNumber('sample-rate-hz', v['sample-rate-hz']);
    const resolutionHz = positiveNumber('resolution-hz', v['resolution-hz']);
    if ((sampleRateHz === undefined) !== (resolutionHz === undefined)) {
      throw new CliError('--sample-rate-hz and --resolution-hz go together (both describe the recording)');
    }

    const model = loadMachineFile(path, io);
    const speedRpm = speedRpmFlag ?? model.speed.nominalRpm;
    const speedHz = speedRpm / 60;
    const shafts = shaftSpeeds(model, speedRpm);
    const catalogue = componentLines(model, speedHz, {
      ...(harmonics !== undefined ? { maxHarmonic: { 'shaft-harmonic': harmonics } } : {}),
      ...(sidebands !== undefined ? { sidebands } : {}),
    });
    const lines: Array<ComponentLine | FlaggedLine> =
      sampleRateHz !== undefined && resolutionHz !== undefined
        ? flagLines(catalogue, { sampleRateHz, frequencyResolutionHz: resolutionHz })
        : catalogue;

    if (v.json) {
      io.out(JSON.stringify({
        machine: model.id,
        referenceShaft: model.speed.shaft,
        referenceSpeedRpm: speedRpm,
        referenceSpeedHz: speedHz,
        shafts,
        lines,
      }, null, 2));
      return 0;
    }

    const range = speedRangeRpm(model);
    const out: string[] = [];
    out.push(`${model.id}${model.name ? `: ${model.name}` : ''}`);
    out.push(`reference shaft ${model.speed.shaft} at ${speedRpm} rpm (${fixed(speedHz, 3)} Hz)${speedRpmFlag === undefined ? ', nominal' : ''}`);
    if (speedRpm < range.minRpm || speedRpm > range.maxRpm) {
      out.push(`note: ${speedRpm} rpm is outside the model's speed range ${range.minRpm}-${range.maxRpm} rpm`);
    }
    out.push('', 'Shafts');
    out.push(...alignColumns(
      [['shaft', 'ratio', 'rpm', 'Hz', 'via'], ...shafts.map((s) => [s.shaft, s.ratio.toPrecision(6), fixed(s.speedRpm, 2), fixed(s.speedHz, 4), s.via.join(' > ')])],
      new Set([1, 2, 3]),
    ).map((l) => `  ${l}`));

    out.push('', `Lines (${lines.length})`);
    const groups = new Map<string, Array<ComponentLine | FlaggedLine>>();
    for (const line of lines) {
      const key = `${line.componentKind}\u0000${line.component}`;
      const group = groups.get(key);
      if (group) group.push(line);
      else groups.set(key, [line]);
    }
    for (const group of groups.values()) {
      out.push('', componentTitle(model, group[0]!));
      const sorted = [...group].sort((a, b) => a.frequencyHz - b.frequencyHz);
      const rows = [['Hz', 'order', 'line', 'formula', 'flags'], ...sorted.map((l) => [fixed(l.frequencyHz, 3), fixed(l.order, 4), l.label, l.formula, flagText(l)])];
      out.push(...alignColumns(rows, new Set([0, 1])).map((l) => `  ${l}`));
    }
    io.out(out.join('\n'));
    return 0;
  },
};
