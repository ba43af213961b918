// Runs in the PDF worker thread (renderer.ts): layout and rendering take seconds of CPU for a long
// document, so they never run on the thread that answers requests. The renderers are TypeScript
// (JSX), so this thread registers tsx's loader for itself before importing them, whether the app
// runs under tsx or under the test runner.
import { fileURLToPath } from 'node:url';
import { tsImport } from 'tsx/esm/api';

// The server's own tsconfig (its JSX runtime), whichever folder the process was started from.
const tsconfig = fileURLToPath(new URL('../../tsconfig.json', import.meta.url));
const { renderNow } = await tsImport('./render.ts', { parentURL: import.meta.url, tsconfig });

/** @param {import('./render.ts').AnyDocument} document */
export default async function renderTask(document) {
  const bytes = await renderNow(document);
  // A copy of exactly the PDF's bytes (a Buffer may sit inside a larger pooled block).
  return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength).slice();
}
