// pg ships no type declarations of its own; only what sequelize.ts uses of it.
declare module 'pg' {
  import type { EventEmitter } from 'node:events';

  export class Client extends EventEmitter {
    constructor(config?: unknown);
  }
  const pg: { Client: typeof Client };
  export default pg;
}
