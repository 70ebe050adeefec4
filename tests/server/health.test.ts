import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { useTestApp } from '../support/db';

const env = useTestApp();

describe('GET /api/health', () => {
  it('reports the database up when MariaDB answers', async () => {
    const res = await request(env.app).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', database: 'up' });
  });

  it('answers unknown API routes with a JSON 404', async () => {
    const res = await request(env.app).get('/api/nothing-here').expect(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
