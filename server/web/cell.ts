import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';

/** Placeholder while the cell pages are built. */
export function cellRouter(_store: StudyStore): Router {
  return Router();
}
