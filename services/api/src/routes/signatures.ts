import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { problem } from '../problems.js';
import { idParam } from '../schemas.js';
import { faultList, MAX_PARTIAL_SUM_COUNT, MAX_PARTIAL_SUM_HARMONICS, signatureView, WAVEFORM_POINTS } from '../signature-view.js';
import { findMachine } from '../store.js';

/*
 * Predicted fault signatures of a machine's current model (the signature explorer of the console).
 * Thin: the machine's model goes to @kinespec/signatures (through signature-view.ts), its answer comes back as JSON.
 */

/** Named errors of the packages (bad fault, unknown component) are the caller's: 400. */
function callPackage<T>(f: () => T): T {
  try {
    return f();
  } catch (err) {
    const e = err as { name?: string; code?: unknown; message?: string };
    if (err instanceof Error && typeof e.code === 'string' && /InputError$/.test(e.name ?? '')) {
      throw problem('validation-failed', e.message ?? 'invalid signature request', { code: e.code });
    }
    throw err;
  }
}

const excitationSchema = z.looseObject({
  template: z.string(),
  formula: z.string(),
  reference: z.string().describe('what the waveform and coefficients are fractions of, e.g. the mean mesh torque'),
  mean: z.number(),
  fundamentalOrder: z.number().nullable().describe("the excitation's fundamental as an order of the reference shaft"),
  modulationOrder: z.number().nullable(),
  shaft: z.string().describe('the shaft whose revolutions angleRev counts'),
  periodRev: z.number().nullable().describe('one period of the excitation in revolutions of that shaft'),
  angleRev: z.array(z.number()).describe(`${WAVEFORM_POINTS} equally spaced angles over one period, in revolutions of the shaft (empty for fixed-line faults)`),
  waveform: z.array(z.number()).describe('the excitation evaluated exactly from its piecewise segments at angleRev'),
  partialSums: z.record(z.string().regex(/^\d+$/), z.array(z.number()))
    .describe('partial sums of the Fourier series of the same waveform at angleRev, keyed by the number of harmonics N'),
});

const magnificationSchema = z.array(z.looseObject({
  harmonic: z.number(),
  sideband: z.number(),
  frequencyHz: z.number(),
  factor: z.number().describe('dynamic magnification of the line by the machine response (torsional x structural)'),
  torsional: z.number().nullable(),
  structural: z.number().nullable(),
})).describe('one entry per predicted line, in the order of lines (whose label names it)');

const signatureSchema = z.looseObject({
  lines: z.array(z.looseObject({ frequencyHz: z.number() })),
  naturalFrequenciesHz: z.array(z.number()),
  warnings: z.array(z.unknown()),
  excitation: excitationSchema,
  magnification: magnificationSchema,
  campbell: z.looseObject({}).describe('natural frequencies against the excitation orders over the speed range, and their crossings'),
});

/** "1,5,20" → [1, 5, 20]; each a whole number 1..MAX_PARTIAL_SUM_HARMONICS, at most MAX_PARTIAL_SUM_COUNT of them. */
function parsePartialSums(text: string): number[] {
  const counts = text.split(',').map(Number);
  const bad = counts.find((n) => !Number.isInteger(n) || n < 1 || n > MAX_PARTIAL_SUM_HARMONICS);
  if (bad !== undefined || counts.length > MAX_PARTIAL_SUM_COUNT) {
    const detail = bad !== undefined
      ? `partialSums: ${bad} must be a whole number from 1 to ${MAX_PARTIAL_SUM_HARMONICS}`
      : `partialSums: at most ${MAX_PARTIAL_SUM_COUNT} values (got ${counts.length})`;
    throw problem('validation-failed', detail, { errors: [{ path: 'query.partialSums', message: detail.slice('partialSums: '.length) }] });
  }
  return counts;
}

export const signatureRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  const { sql } = services;

  async function modelOf(siteId: string, machineKey: string) {
    const machine = await findMachine(sql, siteId, machineKey);
    if (!machine) throw problem('not-found', `no machine '${machineKey}' on this site`);
    if (machine.currentModelVersion === null) throw problem('no-machine-model', `machine '${machineKey}' has no model`);
    const model = await services.models.get(sql, machine.id, machine.currentModelVersion);
    if (!model) throw problem('no-machine-model', `machine '${machineKey}' has no usable model`);
    return model;
  }

  app.get('/faults', {
    config: { permission: 'read' },
    schema: {
      summary: "Every (fault, component) candidate of the machine's current model",
      tags: ['signatures'],
      querystring: z.object({ machine: idParam }),
      response: { 200: z.array(z.looseObject({ fault: z.string(), component: z.string() })) },
    },
  }, async (request) => {
    const model = await modelOf(request.apiKey!.siteId, request.query.machine);
    return callPackage(() => faultList(model));
  });

  app.get('/signatures', {
    config: { permission: 'read' },
    schema: {
      summary: 'The predicted signature of one fault of a machine at a speed: lines, excitation waveform, magnification, Campbell data',
      tags: ['signatures'],
      querystring: z.object({
        machine: idParam,
        fault: z.string().min(1).max(64),
        component: idParam,
        speedRpm: z.coerce.number().positive().finite().optional(),
        point: idParam.optional(),
        harmonics: z.coerce.number().int().min(1).max(500).optional(),
        partialSums: z.string().max(64).regex(/^\d+(,\d+)*$/, 'must be whole numbers separated by commas, e.g. 1,5,20').optional()
          .describe(`harmonic counts of the partial sums to send (default 1,3,10,30 and harmonics); at most ${MAX_PARTIAL_SUM_COUNT}, each 1..${MAX_PARTIAL_SUM_HARMONICS}`),
      }),
      response: { 200: signatureSchema },
    },
  }, async (request) => {
    const q = request.query;
    const partialSums = q.partialSums !== undefined ? parsePartialSums(q.partialSums) : undefined;
    const model = await modelOf(request.apiKey!.siteId, q.machine);
    // the package's interfaces have no index signature; the response schema checks the shape when it serialises
    const view: unknown = callPackage(() =>
      signatureView(model, {
        fault: q.fault,
        component: q.component,
        ...(q.speedRpm !== undefined ? { speedRpm: q.speedRpm } : {}),
        ...(q.point !== undefined ? { point: q.point } : {}),
        ...(q.harmonics !== undefined ? { harmonics: q.harmonics } : {}),
        ...(partialSums !== undefined ? { partialSums } : {}),
      }),
    );
    return view as z.infer<typeof signatureSchema>;
  });
};
