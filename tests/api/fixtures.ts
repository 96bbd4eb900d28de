import { readFileSync } from 'node:fs';
import { encodeWav } from '@kinespec/signal';

/*
 * Inputs for the API suites with answers known in closed form. An acceleration sine
 * a(t) = A sin(2 pi f t) has the velocity amplitude A / (2 pi f), so its r.m.s. velocity is
 * A / (2 pi f sqrt 2) (common practice: v = a / omega for a sine, RMS = peak / sqrt 2). With
 * f = 1000 / (2 pi) Hz, inside the ISO 10-1000 Hz band, omega = 1000 rad/s and A = 10 m/s^2 reads
 * 10 mm/s peak, 7.0711 mm/s r.m.s.
 */

export const MACHINE = 'aeration-mixer-2';
export const POINT = 'gb-input-h';
export const modelText = readFileSync(new URL('../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8');

export const SAMPLE_RATE_HZ = 25_600;
export const SAMPLE_COUNT = 2 ** 15;
export const OMEGA_RAD_PER_S = 1000;

/** r.m.s. velocity in mm/s of the acceleration sine of amplitude `amplitudeMPerS2` at omega = 1000 rad/s. */
export function sineVelocityRmsMmPerS(amplitudeMPerS2: number): number {
  return (amplitudeMPerS2 / OMEGA_RAD_PER_S / Math.SQRT2) * 1000;
}

/** Samples (m/s^2) of the sine, with a small second tone so every file differs by amplitude. */
export function sine(amplitudeMPerS2: number, n = SAMPLE_COUNT): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = amplitudeMPerS2 * Math.sin((OMEGA_RAD_PER_S * i) / SAMPLE_RATE_HZ);
  return x;
}

/** An acceleration sine (m/s^2) at omega = 1000 rad/s whose r.m.s. velocity is `v` mm/s: A = v √2 ω / 1000. */
export function accelerationWithVelocityRms(v: number): Buffer {
  return wav(sine((v * Math.SQRT2 * OMEGA_RAD_PER_S) / 1000));
}

export function wav(samples: Float64Array): Buffer {
  return Buffer.from(encodeWav({ sampleRateHz: SAMPLE_RATE_HZ, channels: [{ name: 'acc', unit: 'm/s^2', samples }], metadata: {} }, { format: 'float32' }));
}

export function csv(samples: Float64Array): string {
  return `acc\n${Array.from(samples, (v) => v.toPrecision(9)).join('\n')}\n`;
}

export function json(samples: Float64Array): string {
  return JSON.stringify({ sampleRateHz: SAMPLE_RATE_HZ, unit: 'm/s^2', channels: [{ name: 'acc', samples: Array.from(samples, (v) => Number(v.toPrecision(9))) }] });
}

export function float32(samples: Float64Array): Buffer {
  return Buffer.from(new Float32Array(samples).buffer);
}

/** A multipart/form-data body with fields before the file, as a browser form sends it. */
export function multipart(fields: Record<string, string>, file: { name: string; type: string; bytes: Buffer }): { body: Buffer; contentType: string } {
  const boundary = '----kinespec-test-boundary';
  const parts: Buffer[] = [];
  for (const [name, value] of Object.entries(fields)) {
    parts.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`));
  }
  parts.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${file.name}"\r\nContent-Type: ${file.type}\r\n\r\n`));
  parts.push(file.bytes, Buffer.from(`\r\n--${boundary}--\r\n`));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}
