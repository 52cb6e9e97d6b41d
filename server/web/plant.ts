import { Router } from 'express';
import type { StudyStore } from '../scenario/store.js';
import { economicsRouter } from './economics.js';
import { plantSizingRouter } from './plant-sizing.js';

/** Plant-level pages and APIs: sizing, shunt currents and safety; coatings and costs. */
export function plantRouter(store: StudyStore): Router {
  const r = Router();
  r.use(plantSizingRouter(store));
  r.use(economicsRouter(store));
  return r;
}
