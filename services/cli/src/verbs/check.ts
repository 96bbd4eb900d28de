import { speedRangeRpm, type MachineModel } from '@kinespec/kinematics';
import { CliError } from '../cli-error.js';
import { parseFlags } from '../flags.js';
import { machineFileArgument, problemLines, readMachineFile } from '../machine-file.js';
import type { Verb } from '../verb.js';

/** The one-line usage that error messages end with. */
const SHORT_USAGE = 'kinespec check <machine.json>';

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** One line saying what a valid model holds. */
export function modelSummary(model: MachineModel): string {
  const { minRpm, nominalRpm, maxRpm } = speedRangeRpm(model);
  const parts = [
    plural(model.shafts.length, 'shaft'),
    plural(model.belts.length, 'belt'),
    plural(model.gearMeshes.length, 'gear mesh', 'gear meshes'),
    plural(model.bearings.length, 'bearing'),
    plural(model.rotors.length, 'rotor'),
    model.motor ? `${model.motor.poles}-pole ${model.motor.lineFrequencyHz} Hz motor` : 'no motor',
    model.torsional ? `torsional ${plural(model.torsional.inertias.length, 'inertia')}/${plural(model.torsional.links.length, 'link')}` : 'no torsional section',
    plural(model.points.length, 'point'),
  ];
  const range = minRpm === maxRpm ? `${nominalRpm} rpm` : `${nominalRpm} rpm (${minRpm}-${maxRpm})`;
  const iso = model.iso ? `, ISO group ${model.iso.group} ${model.iso.foundation}` : '';
  return `${model.id}${model.name ? ` (${model.name})` : ''}: ${parts.join(', ')}; reference shaft ${model.speed.shaft} at ${range}${iso}`;
}

export const checkVerb: Verb = {
  name: 'check',
  summary: 'Validate a machine model file (JSON or YAML) and print every problem with its path',
  usage: 'kinespec check <machine.json|yaml> [--json]\n\n  Exit 0 when the model is valid, 2 when it is not (every problem is printed first).',
  async run(args, io) {
    const { values, positionals } = parseFlags(args, { json: { type: 'boolean', default: false } }, SHORT_USAGE);
    const path = machineFileArgument(positionals, SHORT_USAGE);
    const result = readMachineFile(path);
    if (values.json) {
      io.out(JSON.stringify(result.ok ? { ok: true, summary: modelSummary(result.model) } : { ok: false, problems: result.problems }, null, 2));
      if (!result.ok) throw new CliError(`${path}: ${plural(result.problems.length, 'problem')}`);
      return 0;
    }
    if (result.ok) {
      io.out(`ok ${path}: ${modelSummary(result.model)}`);
      return 0;
    }
    for (const line of problemLines(result)) io.out(`${path}: ${line}`);
    throw new CliError(`${path}: ${plural(result.problems.length, 'problem')}, not a valid machine model`);
  },
};
