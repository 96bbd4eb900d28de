import { readFileSync } from 'node:fs';
import { loadMachineModel } from '@kinespec/kinematics';
import { envelopeSpectrum, type Recording } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, impactTrain, sine } from '../../test/signals.js';
import { analyseRecording } from '../analyse-recording.js';
import { DiagnosisInputError } from '../errors.js';
import { computeIndicators } from './compute-indicators.js';
import {
  accelerationTrendUnit,
  envelopeLevel,
  findIndicator,
  indicatorDescriptor,
  indicatorDescriptors,
  indicatorLevels,
  indicatorQuantity,
  levelPointOf,
  indicatorUnit,
  scoreIndicator,
} from './indicator-registry.js';

const machine = (file: string) => loadMachineModel(readFileSync(new URL(`../../../../fixtures/machines/${file}`, import.meta.url), 'utf8'));
const mixer = machine('aeration-mixer-2.json');
const pump = machine('skelmere-feed-pump-3.json');
const fs = 25600;
const n = 32768;

function recording(name: string, unit: string, samples: Float64Array): Recording {
  return { sampleRateHz: fs, channels: [{ name, unit, samples }], metadata: {} };
}

describe('indicator registry', () => {
  it('has one descriptor per name, each with a title, a description and a unit', () => {
    const names = indicatorDescriptors.map((d) => d.name);
    expect(new Set(names).size).toBe(names.length);
    for (const name of ['velocity_rms_mm_per_s', 'acceleration_peak', 'acceleration_rms', 'crest_factor', 'kurtosis', 'speed_rpm', 'envelope_rms', 'kurtogram_kurtosis']) {
      const d = indicatorDescriptor(name);
      expect(d.name).toBe(name);
      expect(d.title.length).toBeGreaterThan(3);
      expect(d.description.length).toBeGreaterThan(20);
    }
    expect(findIndicator('score:bearing-outer-race:input-de')?.name).toBe('score:<fault>:<component>');
    expect(findIndicator('tsa:na4:pinion-1')?.name).toBe('tsa:<fm0|fm4|na4>:<gear>');
    expect(findIndicator('tsa:rms:pinion-1')).toBeNull();
    expect(scoreIndicator('score:gear-missing-tooth:pinion-1')).toEqual({ fault: 'gear-missing-tooth', component: 'pinion-1' });
  });

  it('refuses an unknown indicator with the list of known ones', () => {
    expect(() => indicatorDescriptor('acceleration_pk')).toThrow(DiagnosisInputError);
    expect(() => indicatorDescriptor('acceleration_pk')).toThrow(/acceleration_peak/);
  });

  it('gives every indicator a unit that follows the point: acceleration levels in the point unit or m/s², envelope in the point unit', () => {
    expect(indicatorUnit('velocity_rms_mm_per_s', { unit: 'g' })).toBe('mm/s');
    expect(indicatorUnit('acceleration_peak', { unit: 'g' })).toBe('g');
    expect(indicatorUnit('acceleration_rms', { unit: 'mm/s^2' })).toBe('mm/s^2');
    expect(indicatorUnit('acceleration_peak', { unit: 'mm/s' })).toBe('m/s^2');
    expect(accelerationTrendUnit({ unit: null })).toBe('m/s^2');
    expect(indicatorUnit('envelope_rms', { unit: 'g' })).toBe('g');
    expect(indicatorUnit('envelope_rms', { unit: 'mm/s' })).toBe('mm/s');
    expect(indicatorQuantity('envelope_rms', { unit: 'mm/s' })).toBe('velocity');
    expect(indicatorUnit('kurtosis', { unit: 'g' })).toBe('1');
    expect(indicatorUnit('speed_rpm', { unit: 'g' })).toBe('rpm');
    expect(indicatorUnit('score:unbalance:fan', { unit: 'g' })).toBe('1');
    expect(indicatorDescriptor('speed_rpm').worseWhen).toBe('none');
  });
});

describe('indicatorLevels', () => {
  const vibration = { quantity: 'velocity' as const, iso: { group: 2 as const, foundation: 'rigid' as const }, alarmVelocityRmsMmPerS: null, tripVelocityRmsMmPerS: null, baselineVelocityRmsMmPerS: null };

  it('grades the overall velocity by ISO 10816-3 group 2 rigid: zones 1.4 / 2.8 / 4.5 mm/s, alarm at B/C, trip at C/D (check-values §7)', () => {
    expect(indicatorLevels('velocity_rms_mm_per_s', vibration)).toEqual({ alarmLevel: 2.8, tripLevel: 4.5, zoneBoundaries: { ab: 1.4, bc: 2.8, cd: 4.5 } });
    // with a baseline of 1 mm/s: ALARM = baseline + 0.25 × B/C = 1.7 mm/s (ISO 10816-3 §6.3)
    expect(indicatorLevels('velocity_rms_mm_per_s', { ...vibration, baselineVelocityRmsMmPerS: 1 }).alarmLevel).toBeCloseTo(1.7, 12);
    expect(indicatorLevels('velocity_rms_mm_per_s', { ...vibration, alarmVelocityRmsMmPerS: 3, tripVelocityRmsMmPerS: 6 })).toMatchObject({ alarmLevel: 3, tripLevel: 6 });
  });

  it('alarms a fault score at 0.5 with no trip, and gives other indicators no levels of their own', () => {
    expect(indicatorLevels('score:unbalance:fan', vibration)).toEqual({ alarmLevel: 0.5, tripLevel: null, zoneBoundaries: null });
    expect(indicatorLevels('kurtosis', vibration)).toEqual({ alarmLevel: null, tripLevel: null, zoneBoundaries: null });
  });

  it('gives tach and encoder points no levels at all: levels belong to vibration points', () => {
    expect(indicatorLevels('velocity_rms_mm_per_s', { ...vibration, quantity: 'tach' })).toEqual({ alarmLevel: null, tripLevel: null, zoneBoundaries: null });
    expect(indicatorLevels('score:unbalance:fan', { ...vibration, quantity: 'encoder' }).alarmLevel).toBeNull();
    const point = levelPointOf(pump, 'train-tach')!;
    expect(point.quantity).toBe('tach');
    expect(levelPointOf(pump, 'pump-de-v')!.iso).not.toBeNull();
    expect(levelPointOf(pump, 'nowhere')).toBeNull();
  });
});

describe('envelopeLevel', () => {
  it('gives A·(2m² + m⁴/8)^¼ for a carrier of amplitude A modulated 1 + m·cos ωt, and 0 for a steady tone (Randall & Antoni 2011, §3)', () => {
    const A = 2;
    const m = 0.5;
    // 3200 Hz carrier, 100 Hz modulation, whole periods in every 2048-sample Welch segment at 25.6 kHz: the lines at
    // 100 and 200 Hz of the squared envelope fall on bins and bandRms reads their power exactly
    const am = Float64Array.from({ length: n }, (_, i) => A * (1 + m * Math.cos((2 * Math.PI * 100 * i) / fs)) * Math.cos((2 * Math.PI * 3200 * i) / fs));
    const spectrum = envelopeSpectrum(am, fs, { bandHz: [2000, 4400], squared: true, segmentLength: 2048 });
    // e² = A²(1 + m²/2 + 2m cos ωt + (m²/2) cos 2ωt): fluctuation r.m.s. A²·√(2m² + m⁴/8)
    expect(envelopeLevel(spectrum)).toBeCloseTo(Math.sqrt(A * A * Math.sqrt(2 * m * m + m ** 4 / 8)), 4);
    const tone = sine(n, fs, 3200, A);
    // the root of round-off: about 1e-6 of a 2 g tone
    expect(envelopeLevel(envelopeSpectrum(tone, fs, { bandHz: [2000, 4400], squared: true, segmentLength: 2048 }))).toBeLessThan(1e-4);
  });
});

describe('computeIndicators', () => {
  const speedHz = 1480 / 60;
  const gPoint = add(gaussianNoise(n, 3, 0.05), sine(n, fs, speedHz, 0.2), impactTrain({ sampleRateHz: fs, length: n, rateHz: 87, resonanceHz: 3400, dampingRatio: 0.05, amplitude: 0.5, seed: 2 }));

  it('computes only the time indicators from the acceleration signal, equal to analyseRecording', () => {
    const names = ['acceleration_peak', 'acceleration_rms', 'crest_factor', 'kurtosis'];
    const c = computeIndicators(recording('gb-input-h', 'g', gPoint), names, { model: mixer, pointId: 'gb-input-h' });
    expect(c.stage).toBe('time');
    const a = analyseRecording(recording('gb-input-h', 'g', gPoint), { model: mixer, pointId: 'gb-input-h' });
    for (const name of names) {
      expect(c.values[name]).toBe(a.indicators[name]);
      expect(c.units[name]).toBe(a.indicatorUnits![name]);
    }
    expect(c.units.acceleration_peak).toBe('g');
  });

  it('computes the envelope level without the fault hypotheses, equal to the whole analysis (the default band reads no hypothesis)', () => {
    const names = ['envelope_rms', 'kurtogram_kurtosis', 'acceleration_rms'];
    const c = computeIndicators(recording('gb-input-h', 'g', gPoint), names, { model: mixer, pointId: 'gb-input-h' });
    expect(c.stage).toBe('envelope');
    const a = analyseRecording(recording('gb-input-h', 'g', gPoint), { model: mixer, pointId: 'gb-input-h' });
    expect(a.hypotheses.length).toBeGreaterThan(0);
    for (const name of names) if (a.indicators[name] !== undefined) expect(c.values[name]).toBe(a.indicators[name]);
    expect(c.values.envelope_rms).toBeGreaterThan(0);
    const cut = analyseRecording(recording('gb-input-h', 'g', gPoint), { model: mixer, pointId: 'gb-input-h', hypotheses: false });
    expect(cut.hypotheses).toEqual([]);
    expect(cut.indicators.envelope_rms).toBe(a.indicators.envelope_rms);
  });

  it('computes the overall velocity from one spectrum, equal to analyseRecording', () => {
    const c = computeIndicators(recording('gb-input-h', 'g', gPoint), ['velocity_rms_mm_per_s'], { model: mixer, pointId: 'gb-input-h' });
    expect(c.stage).toBe('spectrum');
    const a = analyseRecording(recording('gb-input-h', 'g', gPoint), { model: mixer, pointId: 'gb-input-h' });
    expect(c.values.velocity_rms_mm_per_s).toBe(a.indicators.velocity_rms_mm_per_s);
  });

  it('converts a recording made in m/s² at a g point to g, as analyseRecording reports it', () => {
    const ms2 = gPoint.map((x) => x * 9.80665);
    const c = computeIndicators(recording('gb-input-h', 'm/s^2', ms2), ['acceleration_peak'], { model: mixer, pointId: 'gb-input-h' });
    const a = analyseRecording(recording('gb-input-h', 'm/s^2', ms2), { model: mixer, pointId: 'gb-input-h' });
    expect(c.values.acceleration_peak).toBeCloseTo(a.indicators.acceleration_peak!, 12);
    expect(a.indicatorUnits!.acceleration_peak).toBe('g');
    // standard gravity 9.80665 m/s² (3rd CGPM 1901): the same peak in g as the g recording
    expect(c.values.acceleration_peak).toBeCloseTo(computeIndicators(recording('gb-input-h', 'g', gPoint), ['acceleration_peak'], { model: mixer, pointId: 'gb-input-h' }).values.acceleration_peak!, 9);
  });

  it('gives a velocity point the acceleration its band covers: 10 mm/s at 49.4 Hz plus high-frequency noise reads 2π·f·v', () => {
    const f = 2965 / 60;
    // white noise of 0.2 mm/s r.m.s. up to 12.8 kHz: differentiated over the whole band it alone would read
    // 0.2 mm/s·2π·12.8 kHz/√3 ≈ 9.3 m/s² r.m.s.; up to 1 kHz, 0.2·√(1/12.8) mm/s·2π·1 kHz/√3 ≈ 0.2 m/s² r.m.s.
    const v = add(sine(n, fs, f, 10), gaussianNoise(n, 5, 0.2));
    const names = ['acceleration_peak', 'kurtosis', 'velocity_rms_mm_per_s', 'envelope_rms'];
    const a = analyseRecording(recording('pump-de-v', 'mm/s', v), { model: pump, pointId: 'pump-de-v' });
    const c = computeIndicators(recording('pump-de-v', 'mm/s', v), names.slice(0, 3), { model: pump, pointId: 'pump-de-v' });
    // a = 2π·49.42·0.010 = 3.105 m/s² (common practice), plus the in-band noise
    expect(a.indicators.acceleration_peak).toBeGreaterThan(3.0);
    expect(a.indicators.acceleration_peak).toBeLessThan(4.5);
    expect(a.indicatorUnits!.acceleration_peak).toBe('m/s^2');
    expect(a.indicators.kurtosis).toBeLessThan(3);
    expect(a.indicatorUnits!.envelope_rms).toBe('mm/s');
    for (const name of names.slice(0, 3)) expect(c.values[name]).toBe(a.indicators[name]);
    // 10 mm/s peak is 7.07 mm/s r.m.s. (ISO 20816-1 band 10-1000 Hz holds the line)
    expect(a.indicators.velocity_rms_mm_per_s).toBeCloseTo(10 / Math.SQRT2, 1);
  });

  it('delegates envelope, speed and scores to analyseRecording and returns only what was asked', () => {
    const c = computeIndicators(recording('gb-input-h', 'g', gPoint), ['envelope_rms', 'speed_rpm', 'score:bearing-outer-race:input-de'], { model: mixer, pointId: 'gb-input-h' });
    expect(c.stage).toBe('analysis');
    expect(Object.keys(c.values).sort()).toEqual(['envelope_rms', 'score:bearing-outer-race:input-de', 'speed_rpm']);
    expect(c.units).toEqual({ envelope_rms: 'g', speed_rpm: 'rpm', 'score:bearing-outer-race:input-de': '1' });
  });

  it('gives every indicator of an analysis a unit', () => {
    const a = analyseRecording(recording('gb-input-h', 'g', gPoint), { model: mixer, pointId: 'gb-input-h' });
    expect(Object.keys(a.indicatorUnits!).sort()).toEqual(Object.keys(a.indicators).sort());
    for (const [name, unit] of Object.entries(a.indicatorUnits!)) expect(unit).toBe(indicatorUnit(name, { unit: 'g' }));
  });

  it('refuses an empty list and unknown names', () => {
    expect(() => computeIndicators(recording('x', 'g', gPoint), [])).toThrow(DiagnosisInputError);
    expect(() => computeIndicators(recording('x', 'g', gPoint), ['peak'])).toThrow(/not known/);
  });
});
