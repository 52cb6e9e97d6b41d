import type { Request } from 'express';
import type { StudyStore, StudySummary } from '../scenario/store.js';
import type { Study } from '../scenario/schema.js';
import * as format from './format.js';

export interface NavItem {
  href: string;
  label: string;
  active: boolean;
}

export interface PageContext {
  title: string;
  studyId: string;
  study: Study;
  studies: StudySummary[];
  isExample: boolean;
  nav: NavItem[];
  /** Link to a page of the app keeping the open study. */
  link: (path: string, extra?: Record<string, string>) => string;
  format: typeof format;
}

const PAGES: Array<[string, string]> = [
  ['/', 'Study'],
  ['/kinetics', 'Kinetics'],
  ['/cell', 'Cell'],
  ['/plant', 'Plant'],
  ['/coatings', 'Coatings'],
  ['/costs', 'Costs'],
  ['/safety', 'Safety'],
  ['/report', 'Report'],
];

/** The study a request works on: `?study=` (or a form field `study`), else the default example. */
export function studyIdOf(req: Request, store: StudyStore): string {
  const fromQuery = typeof req.query.study === 'string' ? req.query.study : undefined;
  const fromBody = req.body && typeof req.body.study === 'string' ? (req.body.study as string) : undefined;
  return fromBody || fromQuery || store.defaultId();
}

export function pageContext(req: Request, store: StudyStore, title: string, activePath: string): PageContext {
  const studyId = studyIdOf(req, store);
  const study = store.get(studyId);
  const link = (p: string, extra: Record<string, string> = {}): string => {
    const params = new URLSearchParams({ study: studyId, ...extra });
    return `${p}?${params.toString()}`;
  };
  return {
    title,
    studyId,
    study,
    studies: store.list(),
    isExample: store.isExample(studyId),
    nav: PAGES.map(([href, label]) => ({ href: link(href), label, active: href === activePath })),
    link,
    format,
  };
}
