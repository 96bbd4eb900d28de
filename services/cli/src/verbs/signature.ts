import { parseArgs } from 'node:util';
import {
  faultKinds, isFaultKind, predictSignature, SignatureInputError, toothDropShapes, type Signature, type SignatureOptions, type ToothDropShape,
} from '@kinespec/signatures';
import { CliError } from '../cli-error.js';
import { loadMachineFile } from '../machine-file.js';
import type { Verb } from '../verb.js';

function number(name: string, text: string | undefined, rule: (v: number) => boolean, what: string): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !rule(value)) throw new CliError(`--${name} must be ${what} (got '${text}')`);
  return value;
}
const positive = (name: string, text: string | undefined) => number(name, text, (v) => Number.isFinite(v) && v > 0, 'a number > 0');
const whole = (name: string, text: string | undefined, min: number) => number(name, text, (v) => Number.isInteger(v) && v >= min, `a whole number >= ${min}`);

/** 4 significant figures, exponent form for small or large values. */
function sig(x: number): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e-3 && a < 1e5 ? Number(x.toPrecision(4)).toString() : x.toExponential(3);
}

function table(rows: string[][], right: ReadonlySet<number>): string[] {
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  return rows.map((r) => r.map((cell, c) => (right.has(c) ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ').trimEnd());
}

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
  out.push(...table(rows, new Set([0, 1, 2, 3, 4, 5, 6])));
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
    let parsed;
    try {
      parsed = parseArgs({
        args,
        allowPositionals: true,
        options: {
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
      });
    } catch (err) {
      throw new CliError((err as Error).message);
    }
    const [path, ...extra] = parsed.positionals;
    if (path === undefined) throw new CliError('missing the machine model file (usage: kinespec signature <machine.json> --fault <kind> --component <id>)');
    if (extra.length > 0) throw new CliError(`unexpected argument '${extra[0]}'`);
    const v = parsed.values;
    if (v.fault === undefined) throw new CliError(`--fault is required: one of ${faultKinds.join(', ')}`);
    if (!isFaultKind(v.fault)) throw new CliError(`--fault must be one of ${faultKinds.join(', ')} (got '${v.fault}')`);
    if (v.component === undefined) throw new CliError('--component is required: the id of the shaft, rotor, gear, gear mesh, bearing or motor');
    if (v.shape !== undefined && !(toothDropShapes as readonly string[]).includes(v.shape)) {
      throw new CliError(`--shape must be one of ${toothDropShapes.join(', ')} (got '${v.shape}')`);
    }
    const depth = number('depth', v.depth, (x) => Number.isFinite(x) && x > 0 && x <= 1, 'a fraction > 0 and <= 1');
    const ripple = number('ripple', v.ripple, (x) => Number.isFinite(x) && x >= 0 && x <= 10, 'a number from 0 to 10');
    const options: SignatureOptions = {
      fault: v.fault,
      component: v.component,
      speedRpm: positive('speed-rpm', v['speed-rpm']),
      point: v.point,
      harmonics: whole('harmonics', v.harmonics, 1),
      sidebands: whole('sidebands', v.sidebands, 0),
      meanTorqueNm: positive('mean-torque-nm', v['mean-torque-nm']),
      transferRadiusMm: positive('transfer-radius-mm', v['transfer-radius-mm']),
      depthFraction: depth,
      dropShape: v.shape as ToothDropShape | undefined,
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
