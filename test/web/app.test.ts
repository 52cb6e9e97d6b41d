import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';

let dir: string;
let app: ReturnType<typeof createApp>;

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-app-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('application foundation', () => {
  it('answers /healthz with 200', async () => {
    const res = await request(app).get('/healthz');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok' });
  });

  it('sends a strict Content-Security-Policy with no inline scripts', async () => {
    const res = await request(app).get('/');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-inline');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/); // every script tag has a src
  });

  it('opens the example study by default', async () => {
    const res = await request(app).get('/');
    expect(res.status).toBe(200);
    expect(res.text).toContain('Brackwater Bay pilot line (fictional)');
    expect(res.text).toContain('synthetic');
  });

  it('serves Chart.js from node_modules, not a CDN', async () => {
    const res = await request(app).get('/vendor/chart.umd.min.js');
    expect(res.status).toBe(200);
    expect(res.text.length).toBeGreaterThan(100_000);
  });

  it('answers unknown API paths with a JSON 404 and pages with an HTML 404', async () => {
    const api = await request(app).get('/api/v1/nothing-here');
    expect(api.status).toBe(404);
    expect(api.body.error.message).toMatch(/No such page/);
    const page = await request(app).get('/nothing-here').set('Accept', 'text/html');
    expect(page.status).toBe(404);
    expect(page.text).toContain('<html');
  });

  it('maps malformed JSON to a 400 without a stack trace', async () => {
    const res = await request(app).post('/api/v1/studies').set('Content-Type', 'application/json').send('{"format": ');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Malformed JSON/);
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });

  it('rejects bodies above the size limit with 413', async () => {
    const big = JSON.stringify({ pad: 'x'.repeat(13 * 1024 * 1024) });
    const res = await request(app).post('/api/v1/studies').set('Content-Type', 'application/json').send(big);
    expect(res.status).toBe(413);
  });
});

describe('studies', () => {
  it('lists the example and returns it as JSON', async () => {
    const list = await request(app).get('/api/v1/studies');
    expect(list.status).toBe(200);
    const id = list.body.defaultStudy as string;
    expect(id).toBe('example-brackwater-pilot');
    const study = await request(app).get(`/api/v1/studies/${id}`);
    expect(study.body.format).toBe('electrolysis-study');
    expect(study.body.datasets.length).toBe(8);
  });

  it('names the field and reason for an invalid study, and writes nothing', async () => {
    const res = await request(app).post('/api/v1/studies').send({ format: 'electrolysis-study', version: 1, name: 'x', chemistry: 'mercury-cell', operating: { temperature: 350, pressure: 1e5 } });
    expect(res.status).toBe(400);
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain('chemistry');
    expect(readdirSync(dir).filter((f) => f.endsWith('.study.json'))).toHaveLength(0);
  });

  it('refuses a study from a newer format version with a clear reason', async () => {
    const res = await request(app).post('/studies/upload').field('studyText', JSON.stringify({ format: 'electrolysis-study', version: 99 }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('newer than this program understands');
  });

  it('saves a copy of the example, round-trips it through download, and keeps examples read-only', async () => {
    const example = (await request(app).get('/api/v1/studies/example-brackwater-pilot')).body;
    const created = await request(app).post('/api/v1/studies').send({ ...example, name: 'My copy' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const dl = await request(app).get(`/studies/${id}/download`);
    expect(dl.status).toBe(200);
    expect(dl.headers['content-disposition']).toContain('my-copy.study.json');
    expect(JSON.parse(dl.text)).toEqual({ ...example, name: 'My copy' });
    const onDisk = JSON.parse(readFileSync(path.join(dir, `${id}.study.json`), 'utf8'));
    expect(onDisk.name).toBe('My copy');
    const put = await request(app).put('/api/v1/studies/example-brackwater-pilot').send(example);
    expect(put.status).toBe(400);
  });

  it('uploads a study file through the form and opens it', async () => {
    const example = (await request(app).get('/api/v1/studies/example-brackwater-pilot')).body;
    const res = await request(app)
      .post('/studies/upload')
      .attach('studyFile', Buffer.from(JSON.stringify({ ...example, name: 'Uploaded one' })), 'u.study.json');
    expect(res.status).toBe(303);
    const page = await request(app).get(res.headers.location);
    expect(page.text).toContain('Uploaded one');
  });
});
