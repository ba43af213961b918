import type { Request, RequestHandler } from 'express';
import type { z } from 'zod';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/** Parses with the shared schemas and keeps the parsed (trimmed, coerced, defaulted) values. */
export function validate(schemas: Schemas): RequestHandler {
  return (req, _res, next) => {
    const valid: NonNullable<Request['valid']> = {};
    if (schemas.params) valid.params = schemas.params.parse(req.params);
    if (schemas.query) valid.query = schemas.query.parse(req.query);
    if (schemas.body) valid.body = schemas.body.parse(req.body ?? {});
    req.valid = valid;
    next();
  };
}

export function validBody<S extends z.ZodType>(req: Request, _schema: S): z.output<S> {
  return req.valid?.body as z.output<S>;
}
export function validQuery<S extends z.ZodType>(req: Request, _schema: S): z.output<S> {
  return req.valid?.query as z.output<S>;
}
export function validParams<S extends z.ZodType>(req: Request, _schema: S): z.output<S> {
  return req.valid?.params as z.output<S>;
}
