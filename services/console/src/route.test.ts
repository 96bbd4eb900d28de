import { describe, expect, it } from 'vitest';
import { parseRoute, routeHref } from './route.js';

describe('parseRoute', () => {
  it('sends an empty or unknown hash to the fleet page', () => {
    expect(parseRoute('')).toEqual({ page: 'fleet', id: null, params: {} });
    expect(parseRoute('#/nowhere')).toEqual({ page: 'fleet', id: null, params: {} });
  });

  it('reads the machine id and the query parameters', () => {
    expect(parseRoute('#/machine/mill%20gearbox?point=gb-in&recording=r7')).toEqual({
      page: 'machine',
      id: 'mill gearbox',
      params: { point: 'gb-in', recording: 'r7' },
    });
  });

  it('falls back to the fleet when the machine id is missing', () => {
    expect(parseRoute('#/machine').page).toBe('fleet');
  });
});

describe('routeHref', () => {
  it('round-trips through parseRoute and drops empty parameters', () => {
    const href = routeHref('upload', null, { machine: 'fan/3', point: '', recording: null });
    expect(href).toBe('#/upload?machine=fan%2F3');
    expect(parseRoute(href)).toEqual({ page: 'upload', id: null, params: { machine: 'fan/3' } });
    expect(parseRoute(routeHref('machine', 'a/b', { point: 'p 1' }))).toEqual({ page: 'machine', id: 'a/b', params: { point: 'p 1' } });
  });
});
