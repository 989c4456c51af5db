/**
 * Routes declared with their zod schemas, roles and responses. The same declaration mounts the express
 * handler (guards + validation) and feeds the OpenAPI document, so the two cannot drift apart.
 */
import { Router, type RequestHandler } from 'express';
import type * as z from 'zod';
import { requireRoles, type Role } from './auth/index.ts';
import { validate } from './validate.ts';

export interface ResponseSpec {
  description: string;
  schema?: z.ZodType;
  /** @defaultValue application/json */
  contentType?: string;
}

export interface RouteSpec {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express style, e.g. `/v1/jobs/:jobId`. */
  path: string;
  summary: string;
  description?: string;
  tags: string[];
  /** Roles admitted (any one suffices); undefined means the route is public. */
  roles?: Role[];
  params?: z.ZodObject;
  query?: z.ZodObject;
  body?: z.ZodType;
  responses: Record<number, ResponseSpec>;
}

export class ApiRoutes {
  readonly router = Router();
  readonly specs: RouteSpec[] = [];

  /** Mounts `handlers` behind the spec's role guard and validation, and records the spec for OpenAPI. */
  add(spec: RouteSpec, ...handlers: RequestHandler[]): void {
    this.specs.push(spec);
    const chain: RequestHandler[] = [];
    if (spec.roles) chain.push(requireRoles(...spec.roles));
    if (spec.params || spec.query || spec.body) {
      chain.push(validate({
        ...(spec.params ? { params: spec.params } : {}),
        ...(spec.query ? { query: spec.query } : {}),
        ...(spec.body ? { body: spec.body } : {}),
      }));
    }
    this.router[spec.method](spec.path, ...chain, ...handlers);
  }
}
