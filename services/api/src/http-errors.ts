import type { FastifyError, FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';
import { hasZodFastifySchemaValidationErrors } from 'fastify-type-provider-zod';
import { DATABASE_RETRY_AFTER_S, isDatabaseUnavailable } from './database-errors.js';
import { problem, ProblemError, problemUri, recordingProblem, type FieldError } from './problems.js';

/*
 * Every error leaves as RFC 9457 application/problem+json from the registry in problems.ts.
 * Unexpected errors are logged with their stack and answered with a bare internal-error: the body
 * never carries a stack trace or a driver message.
 */

const frameworkCodes: Record<string, (e: FastifyError) => ProblemError> = {
  FST_ERR_CTP_BODY_TOO_LARGE: () => problem('payload-too-large', 'the request body is larger than KINESPEC_MAX_UPLOAD_BYTES allows'),
  FST_REQ_FILE_TOO_LARGE: () => problem('payload-too-large', 'the uploaded file is larger than KINESPEC_MAX_UPLOAD_BYTES allows'),
  FST_PARTS_LIMIT: () => problem('payload-too-large', 'the form has too many parts'),
  FST_FILES_LIMIT: () => problem('payload-too-large', 'send one file per request'),
  FST_FIELDS_LIMIT: () => problem('payload-too-large', 'the form has too many fields'),
  FST_ERR_CTP_INVALID_MEDIA_TYPE: () => problem('unsupported-media-type', 'this route does not accept that content type'),
  FST_INVALID_MULTIPART_CONTENT_TYPE: () => problem('unsupported-media-type', 'the request is not multipart/form-data'),
  FST_ERR_CTP_EMPTY_JSON_BODY: () => problem('bad-request', 'the JSON body is empty'),
  FST_ERR_CTP_INVALID_JSON_BODY: (e) => problem('bad-request', `the body is not valid JSON: ${e.message}`),
  FST_ERR_CTP_INVALID_CONTENT_LENGTH: () => problem('bad-request', 'Content-Length does not match the body'),
  FST_ERR_CTP_EMPTY_TYPE: () => problem('unsupported-media-type', 'the request has an empty Content-Type'),
  FST_ERR_CTP_INVALID_TYPE: () => problem('unsupported-media-type', 'the Content-Type is not valid'),
  FST_ERR_VALIDATION: (e) => problem('validation-failed', e.message),
  FST_ERR_MAX_PARAM_LENGTH: () => problem('uri-too-long', 'a path segment is longer than the service accepts (ids are at most 64 characters)'),
  FST_ERR_BAD_URL: () => problem('bad-request', 'the request path is not a valid URL component'),
  FST_ERR_ASYNC_CONSTRAINT: () => problem('bad-request', 'the request cannot be routed'),
};

function byStatus(status: number, message: string): ProblemError {
  switch (status) {
    case 401: return problem('unauthorized', message);
    case 403: return problem('forbidden', message);
    case 404: return problem('not-found', message);
    case 413: return problem('payload-too-large', message);
    case 414: return problem('uri-too-long', message);
    case 415: return problem('unsupported-media-type', message);
    case 429: return problem('rate-limited', message);
    case 503: return problem('service-unavailable', message, { headers: { 'retry-after': String(DATABASE_RETRY_AFTER_S) } });
    default: return problem('bad-request', message);
  }
}

const partNames: Record<string, string> = { querystring: 'query', params: 'path', body: 'body', headers: 'header' };

/** Turns anything thrown in a request into a registered problem. */
export function toProblem(error: unknown): ProblemError | null {
  if (error instanceof ProblemError) return error;
  if (hasZodFastifySchemaValidationErrors(error)) {
    const context = partNames[(error as { validationContext?: string }).validationContext ?? ''] ?? 'request';
    const errors: FieldError[] = error.validation.map((v) => ({
      path: [context, ...v.instancePath.split('/').filter(Boolean)].join('.'),
      message: v.message ?? 'is not valid',
      code: v.keyword,
    }));
    const first = errors[0]!;
    return problem('validation-failed', `${first.path}: ${first.message}${errors.length > 1 ? ` (and ${errors.length - 1} more)` : ''}`, { errors });
  }
  if (isDatabaseUnavailable(error)) {
    return problem('service-unavailable', 'the database does not answer right now; retry after the time given', {
      headers: { 'retry-after': String(DATABASE_RETRY_AFTER_S) },
    });
  }
  const e = error as Partial<FastifyError> & { name?: string; where?: string };
  if (e?.name === 'SignalInputError' && typeof e.code === 'string') return recordingProblem(e.code, e.message ?? '', e.where);
  if (typeof e?.code === 'string' && frameworkCodes[e.code]) return frameworkCodes[e.code]!(e as FastifyError);
  const status = e?.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) return byStatus(status, e.message ?? 'bad request');
  return null;
}

export function sendProblem(reply: FastifyReply, request: FastifyRequest, p: ProblemError): FastifyReply {
  for (const [name, value] of Object.entries(p.extras.headers ?? {})) reply.header(name, value);
  return reply
    .code(p.status)
    .type('application/problem+json')
    .send(JSON.stringify(p.body(request.url.split('?')[0])));
}

/**
 * Fastify's `frameworkErrors` option: errors the router raises before any route or error handler runs
 * (a path segment over maxParamLength is 414, a malformed URL 400) leave as problems like every other.
 */
export function frameworkErrors(error: FastifyError, request: FastifyRequest, reply: FastifyReply): void {
  sendProblem(reply, request, toProblem(error) ?? problem('bad-request', 'the request cannot be routed'));
}

/**
 * Fastify's `clientErrorHandler`: a request the HTTP parser itself refuses (bad header syntax, headers over
 * the size limit) is answered on the raw socket, still as problem+json.
 */
export function clientErrorHandler(err: NodeJS.ErrnoException, socket: import('node:net').Socket): void {
  if (socket.destroyed) return;
  if (err.code === 'ECONNRESET' || !socket.writable) {
    socket.destroy(err);
    return;
  }
  const tooLarge = err.code === 'HPE_HEADER_OVERFLOW';
  const body = JSON.stringify({
    type: problemUri('bad-request'),
    title: 'The request is malformed',
    status: 400,
    detail: tooLarge ? 'the request headers are larger than the service accepts' : 'the HTTP request cannot be parsed',
  });
  socket.end(
    `HTTP/1.1 400 Bad Request\r\nContent-Type: application/problem+json\r\n` +
      `Content-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`,
  );
}

export function registerProblemHandlers(app: FastifyInstance): void {
  app.setErrorHandler((error, request, reply) => {
    const p = toProblem(error);
    if (p) {
      if (p.status >= 500) request.log.error({ err: error }, 'request failed');
      return sendProblem(reply, request, p);
    }
    request.log.error({ err: error }, 'unexpected error');
    return sendProblem(reply, request, problem('internal-error', `the service failed; the log holds the details (request ${request.id})`));
  });
  app.setNotFoundHandler((request, reply) =>
    sendProblem(reply, request, problem('not-found', `no route ${request.method} ${request.url.split('?')[0]}`)),
  );
}
