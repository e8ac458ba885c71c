import { describe, expect, test } from 'vitest';
import fs from 'node:fs';
import { Router } from 'express';
import { makeTestApp } from '../support/app';
import { listRoutes } from '../support/routes';
import { allow } from '../../server/middleware/access';

// tests/api/access-matrix.test.ts holds the role × route table checks; this proves its route walker
// would notice a route added without a matrix line or without allow(...) (deny by default).
const matrix = JSON.parse(fs.readFileSync('docs/access-matrix.json', 'utf8')) as Record<string, string[]>;

describe('the access-matrix check itself', () => {
  test('a newly mounted route is found, is missing from the matrix, and one without allow() is reported as such', () => {
    const t = makeTestApp();
    const before = listRoutes(t.app).map((r) => r.key);
    t.app.use('/api/zz-probe', Router().post('/:id/things', allow('owner'), (_req, res) => void res.end()).get('/', (_req, res) => void res.end()));
    const added = listRoutes(t.app).filter((r) => !before.includes(r.key));
    expect(added.map((r) => [r.key, r.access])).toEqual([
      ['POST /api/zz-probe/:id/things', ['owner']],
      ['GET /api/zz-probe', null],
    ]);
    expect(added.some((r) => r.key in matrix)).toBe(false);
  });
});
