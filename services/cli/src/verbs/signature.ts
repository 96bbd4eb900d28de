import {
  faultKinds, predictSignature, SignatureInputError, toothDropShapes, type Signature, type SignatureOptions,
} from '@kinespec/signatures';
import { CliError } from '../cli-error.js';
import { numberFlag, oneOf, parseFlags, positiveNumber, wholeNumber } from '../flags.js';
import { loadMachineFile, machineFileArgument } from '../machine-file.js';
import { significant } from '../significant-figures.js';
import { alignColumns } from '../text-table.js';
import type { Verb } from '../verb.js';

/** The one-line usage that error messages end with; `--help` prints the full one. */
const SHORT_USAGE = 'kinespec signature <machine.json> --fault <kind> --component <id>';

/** 4 significant figures, exponent form below 0.001 and from 1e5 up. */
const sig = (x: number) => significant(x, 4, 1e5);

function text(s: Signature, modelId: string): string[] {
  const out: string[] = [];
  const where = s.componentKind === 'motor' ? '' : ` on ${s.shaft} at ${sig(s.shaftSpeedHz)} Hz`;
  out.push(`${s.fault} in ${s.component} (${s.componentKind}${where}); ${modelId} at ${sig(s.speedRpm)} rpm of ${s.referenceShaft}`);
  const point = s.point ? `point ${s.point}` : 'no measurement point';
  const basis = s.amplitudeBasis === 'model' ? 'amplitudes from the torsional model' : 'relative amplitudes (line against line, not an absolute level)';
  out.push(`${point}: ${s.quantity} in ${s.unit}, peak, ${s.domain === 'envelope' ? 'ENVELOPE spectrum' : 'spectrum'}; ${basis}`);
  out.push(`excitation (${s.excitation.template}): ${s.excitation.formula}`);
  for (const a of s.assumptions) out.push(`  assumes ${a}`);
  out.push(`torsional natural frequencies: ${s.naturalFrequenciesHz.length ? s.naturalFrequenciesHz.map((f) => `${sig(f)} Hz`).join(', ') : 'none (no torsional section)'}`);
  if (s.structuralResonances.length) {
    out.push(`point resonances: ${s.structuralResonances.map((r) => `${sig(r.frequencyHz)} Hz (ζ ${sig(r.dampingRatio)})`).join(', ')}`);
  }
  out.push('');
  const rows = [['frequency Hz', 'order', 'harmonic', 'excitation', 'magnification', `amplitude ${s.unit}`, 'phase deg', 'line']];
  for (const l of s.lines) {
    rows.push([
      l.frequencyHz.toFixed(3), l.order.toFixed(4), l.sideband === 0 ? String(l.harmonic) : `${l.harmonic}${l.sideband > 0 ? '+' : ''}${l.sideband}`,
      sig(l.excitationCoefficient.amplitude), sig(l.magnification), sig(l.amplitude), ((l.phaseRad * 180) / Math.PI).toFixed(1), l.label,
    ]);
  }
  out.push(...alignColumns(rows, new Set([0, 1, 2, 3, 4, 5, 6])));
  if (s.warnings.length) {
    out.push('', 'warnings:');
    for (const w of s.warnings) out.push(`  ${w.kind === 'resonance' ? 'RESONANCE ' : ''}${w.message}`);
  }
  return out;
}

export const signatureVerb: Verb = {
  name: 'signature',
  summary: 'The lines a fault would put into the spectrum of a machine model: Fourier series of its excitation through the machine\'s response',
  usage: [
    'kinespec signature <machine.json|yaml> --fault <kind> --component <id> [--speed-rpm N] [--point id] [--harmonics N] [--json]',
    '                   [--sidebands N] [--mean-torque-nm T] [--transfer-radius-mm R] [--depth F] [--shape S] [--ripple F]',
    '',
    `  --fault KIND           ${faultKinds.join(', ')}`,
    '  --component ID         the shaft, rotor, gear, gear mesh, bearing or motor the fault sits in',
    "  --speed-rpm N          speed of the reference shaft (default: the model's nominalRpm)",
    '  --point ID             measurement point (default: a vibration point on the component\'s shaft)',
    '  --harmonics N          highest harmonic of the excitation (tooth faults: shaft orders, default 3 × teeth)',
    '  --sidebands N          sidebands each side, inner race and rolling element (default 3)',
    '  --mean-torque-nm T     mean torque of the faulty mesh (default 1: amplitudes per N·m)',
    '  --transfer-radius-mm R radius at which gear angle is read as casing motion (default 100)',
    `  --depth F              tooth faults: fraction of the torque lost (missing 1, broken 0.5)`,
    `  --shape S              tooth faults: ${toothDropShapes.join(', ')} (default rectangular)`,
    '  --ripple F             tooth faults: mesh ripple as a fraction of the mean torque (default 0)',
    '  --json                 the whole prediction: { lines: [{ frequencyHz, amplitude, harmonic, ... }], naturalFrequenciesHz, warnings, ... }',
    '',
    'Predictions support, and never replace, the judgement of a qualified engineer.',
  ].join('\n'),
  async run(args, io) {
    const { values: v, positionals } = parseFlags(
      args,
      {
        fault: { type: 'string' },
        component: { type: 'string' },
        'speed-rpm': { type: 'string' },
        point: { type: 'string' },
        harmonics: { type: 'string' },
        sidebands: { type: 'string' },
        'mean-torque-nm': { type: 'string' },
        'transfer-radius-mm': { type: 'string' },
        depth: { type: 'string' },
        shape: { type: 'string' },
        ripple: { type: 'string' },
        json: { type: 'boolean', default: false },
      },
      SHORT_USAGE,
    );
    const path = machineFileArgument(positionals, SHORT_USAGE);
    if (v.fault === undefined) throw new CliError(`--fault is required: one of ${faultKinds.join(', ')}`);
    const fault = oneOf('fault', v.fault, faultKinds);
    if (v.component === undefined) throw new CliError('--component is required: the id of the shaft, rotor, gear, gear mesh, bearing or motor');
    const dropShape = oneOf('shape', v.shape, toothDropShapes);
    const depth = numberFlag('depth', v.depth, (x) => x > 0 && x <= 1, 'a fraction > 0 and <= 1');
    const ripple = numberFlag('ripple', v.ripple, (x) => x >= 0 && x <= 10, 'a number from 0 to 10');
    const options: SignatureOptions = {
      fault,
      component: v.component,
      speedRpm: positiveNumber('speed-rpm', v['speed-rpm']),
      point: v.point,
      harmonics: wholeNumber('harmonics', v.harmonics, 1),
      sidebands: wholeNumber('sidebands', v.sidebands, 0),
      meanTorqueNm: positiveNumber('mean-torque-nm', v['mean-torque-nm']),
      transferRadiusMm: positiveNumber('transfer-radius-mm', v['transfer-radius-mm']),
      depthFraction: depth,
      dropShape,
      rippleFraction: ripple,
    };

    const model = loadMachineFile(path, io);
    let s: Signature;
    try {
      s = predictSignature(model, options);
    } catch (err) {
      if (err instanceof SignatureInputError) throw new CliError(`${err.message} (${err.code})`);
      throw err;
    }
    if (v.json) {
      io.out(JSON.stringify({ machine: model.id, ...s }, null, 2));
    } else {
      io.out(text(s, model.id).join('\n'));
    }
    return 0;
  },
};
