import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';

/** Placeholder while these pages are built. */
export function plantSizingRouter(_store: StudyStore): Router {
  return Router();
}
