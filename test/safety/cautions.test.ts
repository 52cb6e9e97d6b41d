import { describe, expect, it } from 'vitest';
import { CAUTIONS, SAFETY_DISCLAIMER } from '../../server/core/safety/cautions.js';

describe('caution texts', () => {
  it('cover the hazards the domain primer §9 lists, once each', () => {
    const topics = CAUTIONS.map((c) => c.topic);
    expect(new Set(topics).size).toBe(topics.length);
    expect(topics).toEqual(expect.arrayContaining(['chlorine', 'hydrogen-chlorine', 'hydrogen', 'caustic', 'dc-current-magnetic-field', 'pressure']));
  });

  it('every figure has a value, a source and a confidence mark', () => {
    for (const c of CAUTIONS) {
      expect(c.text.length).toBeGreaterThan(80);
      expect(c.figures.length).toBeGreaterThan(0);
      for (const f of c.figures) {
        expect(f.label.trim()).not.toBe('');
        expect(f.value.trim()).not.toBe('');
        expect(f.source.trim()).not.toBe('');
        expect(['source seen', 'via secondary', 'from memory', 'derived']).toContain(f.confidence);
      }
    }
  });

  it('quote the check-values §10 figures: chlorine IDLH 10 ppm, H₂ in air 4.0–75 vol %', () => {
    const all = CAUTIONS.flatMap((c) => c.figures.map((f) => f.value)).join(' | ');
    expect(all).toMatch(/10 ppm/);
    expect(all).toMatch(/4\.0–75 vol %/);
    expect(all).toMatch(/3\.0–92\.5 vol %/);
  });

  it('the disclaimer says that codes, standards and licensed practice govern and results are estimates', () => {
    expect(SAFETY_DISCLAIMER).toMatch(/estimates for design studies/);
    expect(SAFETY_DISCLAIMER).toMatch(/Local codes, standards, permits and licensed engineering practice govern/);
  });
});
