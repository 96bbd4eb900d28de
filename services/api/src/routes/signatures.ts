import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { problem } from '../problems.js';
import { idParam } from '../schemas.js';
import { faultList, signatureView } from '../signature-view.js';
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
      }),
      response: { 200: z.looseObject({ lines: z.array(z.looseObject({ frequencyHz: z.number() })) }) },
    },
  }, async (request) => {
    const q = request.query;
    const model = await modelOf(request.apiKey!.siteId, q.machine);
    const signature = callPackage(() =>
      signatureView(model, {
        fault: q.fault,
        component: q.component,
        ...(q.speedRpm !== undefined ? { speedRpm: q.speedRpm } : {}),
        ...(q.point !== undefined ? { point: q.point } : {}),
        ...(q.harmonics !== undefined ? { harmonics: q.harmonics } : {}),
      }),
    );
    return signature as { lines: Array<{ frequencyHz: number }> };
  });
};
