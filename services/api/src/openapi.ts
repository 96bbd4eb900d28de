import { jsonSchemaTransform } from 'fastify-type-provider-zod';

/*
 * OpenAPI from the zod schemas (fastify-type-provider-zod's jsonSchemaTransform). Routes whose body
 * is read raw (recordings, machine model files) describe it in `rawBody`, which only the document sees.
 */

export interface RawBodyDoc {
  consumes: string[];
  description: string;
}

type Transform = typeof jsonSchemaTransform;

export const openApiTransform: Transform = (args) => {
  const out = jsonSchemaTransform(args);
  const raw = (args.schema as { rawBody?: RawBodyDoc } | undefined)?.rawBody;
  if (!raw) return out;
  const { rawBody: _omit, ...schema } = out.schema as Record<string, unknown>;
  return {
    ...out,
    schema: { ...schema, consumes: raw.consumes, body: { type: 'string', format: 'binary', description: raw.description } },
  } as ReturnType<Transform>;
};
