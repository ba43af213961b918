/**
 * An answer already written as JSON (by PostgreSQL's json_build_object, say): sent as these bytes,
 * with the same Content-Type as res.json, instead of being parsed and serialised again in Node.
 */
export class JsonText {
  constructor(readonly text: string) {}
}
