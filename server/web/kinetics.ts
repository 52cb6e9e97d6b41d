import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';

/** Placeholder while the kinetics pages are built. */
export function kineticsRouter(_store: StudyStore): Router {
  return Router();
}
