import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Request, RequestHandler, Response } from 'express';
import type { Logger } from 'pino';
import type { DecisionPageDto } from '@wingstage/shared';
import { AppError } from '../errors/app-error.js';
import type { Limiter } from '../lib/rate-limits.js';
import { wellFormedToken } from '../middleware/decide-link.js';
import * as approvals from '../services/approvals/index.js';

/** client/src/decide-ssr.tsx as built: the decision page's first view for one token's data. */
type RenderDecidePage = (view: { token: string; page: DecisionPageDto | null }) => { html: string; data: string };

/** Where `vite build --ssr` puts the first-view renderer for a client build in `dist`. */
export const decideRendererFile = (dist: string): string => path.join(`${path.resolve(dist)}-ssr`, 'decide-ssr.js');

/**
 * The page's stylesheets written into it, so the first view paints with the HTML alone: one round
 * trip on a slow phone network instead of two. (About 7 KB compressed; the owner opens this page a
 * handful of times, so there is little for a cache to save.)
 */
function withInlineStyles(html: string, dist: string): string {
  return html.replace(/<link rel="stylesheet"[^>]*?href="\/assets\/([\w.-]+\.css)"[^>]*>/g, (tag, file: string) => {
    const css = path.join(dist, 'assets', file);
    return fs.existsSync(css) ? `<style>${fs.readFileSync(css, 'utf8')}</style>` : tag;
  });
}

/**
 * GET /decide/<token>: the owner's decision page with its first view already in the HTML (the
 * letter, the first item, the running total), rendered by the same React components the browser
 * then hydrates, so the largest paint does not wait for the scripts. The data travels beside it;
 * the page does not ask for it again.
 *
 * The look-up is the API's (same answer, same per-address limit on failed look-ups): an unknown
 * link counts once here and the page shows the not-valid answer without asking the API again. When
 * the renderer is not built, the limit blocks the address, or the look-up fails for another reason,
 * the plain page goes out and the browser asks the API as before.
 */
export function decidePage(options: { dist: string; htmlFile: string; limiter: Limiter; logger: Logger }): RequestHandler {
  const { dist, htmlFile, limiter, logger } = options;
  const rendererFile = decideRendererFile(dist);
  let template: string | null = null;
  let renderer: Promise<RenderDecidePage | null> | undefined;
  const load = (): Promise<RenderDecidePage | null> =>
    (renderer ??= fs.existsSync(rendererFile)
      ? import(pathToFileURL(rendererFile).href).then(
          (m: { renderDecidePage: RenderDecidePage }) => m.renderDecidePage,
          (err: unknown) => {
            logger.warn({ err, file: rendererFile }, 'decision page renderer did not load; sending the plain page');
            return null;
          },
        )
      : Promise.resolve(null));
  // Loaded at start, so the first owner does not wait for it.
  void load();

  const plain = (res: Response) => res.sendFile(htmlFile);

  return async (req: Request, res: Response) => {
    res.setHeader('Cache-Control', 'no-store');
    const token = /^\/decide\/([A-Za-z0-9_-]+)\/?$/.exec(req.path)?.[1];
    const render = await load();
    if (!render || !token || !wellFormedToken(token)) return plain(res);
    const ip = req.ip ?? '';
    if ((await limiter.blocked(ip)) !== null) return plain(res);
    let page: DecisionPageDto | null = null;
    try {
      page = await approvals.getDecisionPage(token);
    } catch (err) {
      if (!(err instanceof AppError && err.status === 404)) {
        req.log.warn({ err }, 'decision page: first view not rendered, sending the plain page');
        return plain(res);
      }
      await limiter.count(ip);
    }
    template ??= withInlineStyles(fs.readFileSync(htmlFile, 'utf8'), dist);
    const view = render({ token, page });
    const html = template
      // Functions, not strings: a `$` in the owner's letter must stay a `$`.
      .replace('<div id="root"></div>', () => `<div id="root">${view.html}</div>`)
      .replace('<script>', () => `${view.data}\n    <script>`);
    res.status(page ? 200 : 404).type('html').send(html);
  };
}
