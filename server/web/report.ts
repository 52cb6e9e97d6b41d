/**
 * Report page: `GET /report?study=<id>` — one printable summary of the open study (study,
 * kinetics, cell, plant, coatings, costs, safety, assumptions) for a design review, to print
 * or save as PDF from the browser. Thin handler: the view-model (./report-view.ts) calls the
 * same computations as the other pages; a section whose stored inputs fail shows its error in
 * place and the rest of the report still renders.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { Router, type Request, type Response } from 'express';
import { ROOT } from '../paths.js';
import type { StudyStore } from '../scenario/store.js';
import { pageContext } from './page.js';
import { buildReport } from './report-view.js';

let cachedVersion: string | undefined;

/** The program's version, from package.json at the project root (read once). */
export function programVersion(): string {
  if (cachedVersion === undefined) {
    const pkg = JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { version?: unknown };
    cachedVersion = typeof pkg.version === 'string' && pkg.version ? pkg.version : 'unversioned';
  }
  return cachedVersion;
}

export function reportRouter(store: StudyStore): Router {
  const r = Router();

  r.get('/report', (req: Request, res: Response) => {
    const ctx = pageContext(req, store, 'Report', '/report');
    const report = buildReport(ctx.study, { link: (p) => ctx.link(p), generatedAt: new Date(), version: programVersion() });
    // The title names the study: browsers offer it as the PDF file name.
    res.render('report', { ...ctx, title: `Design report: ${ctx.study.name}`, report });
  });

  return r;
}
