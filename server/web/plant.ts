import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';

/** Placeholder while the plant pages are built. */
export function plantRouter(_store: StudyStore): Router {
  return Router();
}
