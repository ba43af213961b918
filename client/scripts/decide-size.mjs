#!/usr/bin/env node
// What a phone downloads as JavaScript to open the owner's decision page: every script and
// modulepreload that the built decide.html names, each compressed with gzip -9, added up.
//
//   node client/scripts/decide-size.mjs [distDir]    (after `npm run build -w client`)
//   npm run size:decide -w client
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

/**
 * Budget for the sum of gzip -9 sizes, in bytes: the performance goal for the owner's page on a
 * phone (≤ 150 KB). 139,695 B measured on the production build npm start serves, in ten files.
 */
export const DECIDE_JS_BUDGET = 150_000;

/** Same-origin paths of the scripts and module preloads an HTML page names, in order. */
export function scriptsOf(html) {
  const found = [];
  for (const tag of html.match(/<(script|link)\b[^>]*>/gi) ?? []) {
    const attr = (name) => new RegExp(`\\b${name}\\s*=\\s*"([^"]*)"`, 'i').exec(tag)?.[1];
    if (/^<script/i.test(tag) && attr('src')) found.push(attr('src'));
    else if (/^<link/i.test(tag) && (attr('rel') ?? '').toLowerCase() === 'modulepreload' && attr('href')) found.push(attr('href'));
  }
  return found;
}

/** Each file's raw and gzip -9 size, and the totals. */
export function measure(distDir, page = 'decide.html') {
  const html = readFileSync(path.join(distDir, page), 'utf8');
  const files = scriptsOf(html).map((src) => {
    const data = readFileSync(path.join(distDir, src.replace(/^\//, '')));
    return { file: src, bytes: data.length, gzip: gzipSync(data, { level: 9 }).length };
  });
  return { files, bytes: files.reduce((s, f) => s + f.bytes, 0), gzip: files.reduce((s, f) => s + f.gzip, 0) };
}

const kb = (n) => `${(n / 1024).toFixed(1)} KiB`;

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const dist = path.resolve(process.argv[2] ?? path.join(path.dirname(fileURLToPath(import.meta.url)), '..', 'dist'));
  const m = measure(dist);
  for (const f of m.files) console.log(`${f.file.padEnd(48)} ${String(f.bytes).padStart(8)} B  gzip -9 ${String(f.gzip).padStart(7)} B`);
  console.log(`decide.html JavaScript: ${m.files.length} files, ${m.bytes} B (${kb(m.bytes)}), gzip -9 ${m.gzip} B (${kb(m.gzip)}); budget ${DECIDE_JS_BUDGET} B`);
}
