// Runs in a worker thread of the password pool (passwords.ts): bcrypt is pure JavaScript and takes
// a quarter of a second of CPU per password, so it must never run on the thread that answers requests.
// Plain JavaScript on purpose: worker threads load it without the TypeScript loader.
import bcrypt from 'bcryptjs';

/** @param {{ op: 'hash', password: string, cost: number } | { op: 'compare', password: string, hash: string }} task */
export default function passwordTask(task) {
  if (task.op === 'hash') return bcrypt.hashSync(task.password, task.cost);
  return bcrypt.compareSync(task.password, task.hash);
}
