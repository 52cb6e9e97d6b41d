import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';

/** Placeholder while these pages are built. */
export function economicsRouter(_store: StudyStore): Router {
  return Router();
}
