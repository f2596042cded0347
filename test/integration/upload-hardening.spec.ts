/**
 * Attacks on the upload routes (issue 13), against a real PostgreSQL: an empty or cut-off
 * multipart body is a 4xx in the error shape.
 */
import { request as httpRequest } from 'node:http';
import { CSRF_HEADER } from '@shared/auth';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import {
  createSet, signInAs, startLibraryServer, type LibraryServer, type SignedInClient,
} from './instance-library-support';

const [researcherId] = DEMO_IDENTITIES;

/** A multipart body with one part per file in field `files`, and its content type. */
function multipart(files: readonly { name: string; bytes: Buffer }[], boundary = 'qt-test-boundary-0123456789'): { body: Buffer; contentType: string } {
  const parts: Buffer[] = [];
  for (const f of files) {
    parts.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="${f.name}"\r\nContent-Type: application/octet-stream\r\n\r\n`));
    parts.push(f.bytes, Buffer.from('\r\n'));
  }
  parts.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}

/** A square map file of `side` cells a side, all free but one wall per row. */
function squareMap(side: number): Buffer {
  const row = `${'.'.repeat(side - 1)}@\n`;
  return Buffer.from(`type octile\nheight ${side}\nwidth ${side}\nmap\n${row.repeat(side)}`);
}

interface RawResponse {
  readonly status: number;
  readonly body: { error?: { code: string; message: string; details?: unknown } } & Record<string, unknown>;
}

/**
 * POSTs raw bytes with node:http as `client` (so a body can be cut off or sent as-is); `declaredLength`
 * defaults to the body's length.
 */
function postRaw(url: string, client: SignedInClient, path: string, body: Buffer, contentType: string, declaredLength = body.length): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const req = httpRequest(url + path, {
      method: 'POST',
      headers: { cookie: client.jar.header(), [CSRF_HEADER]: client.csrfToken, 'content-type': contentType, 'content-length': String(declaredLength) },
    }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        try {
          resolve({ status: res.statusCode ?? 0, body: JSON.parse(text) });
        } catch {
          reject(new Error(`not JSON (${res.statusCode}): ${text.slice(0, 200)}`));
        }
      });
    });
    req.on('error', reject);
    // A body shorter than its Content-Length: the client stops sending and half-closes, like a dropped upload.
    req.end(body);
  });
}

const isErrorShape = (body: RawResponse['body']) => typeof body.error?.code === 'string' && typeof body.error?.message === 'string';

describe('upload hardening', () => {
  let lib: LibraryServer;
  let owner: SignedInClient;
  let url: string;

  beforeAll(async () => {
    lib = await startLibraryServer();
    url = lib.server.url;
    owner = await signInAs(url, researcherId.login);
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  describe('bad multipart bodies (item 7)', () => {
    let setId: number;
    beforeAll(async () => {
      setId = await createSet(owner, 'bad multipart');
    });

    it('answers an empty multipart body with 400 in the error shape', async () => {
      const res = await postRaw(url, owner, `/api/instance-sets/${setId}/files`, Buffer.alloc(0), 'multipart/form-data; boundary=qt-test-boundary-0123456789');
      expect(res.status).toBe(400);
      expect(isErrorShape(res.body)).toBe(true);
    });

    it('answers a multipart body without a boundary with 400 in the error shape', async () => {
      const res = await postRaw(url, owner, `/api/instance-sets/${setId}/files`, Buffer.from('x'), 'multipart/form-data');
      expect(res.status).toBe(400);
      expect(isErrorShape(res.body)).toBe(true);
    });

    it('answers a multipart body cut off inside a file with 400 in the error shape, storing nothing', async () => {
      const { body, contentType } = multipart([{ name: 'cut.map', bytes: squareMap(64) }]);
      const cut = body.subarray(0, Math.floor(body.length / 2));
      const res = await postRaw(url, owner, `/api/instance-sets/${setId}/files`, cut, contentType, cut.length);
      expect(res.status).toBe(400);
      expect(isErrorShape(res.body)).toBe(true);
      expect(await lib.sql('SELECT id FROM maps')).toEqual([]);
    });

    it('answers a multipart body cut off between parts with 400 in the error shape', async () => {
      const { body, contentType } = multipart([{ name: 'whole.map', bytes: squareMap(8) }]);
      const cut = body.subarray(0, body.length - '--\r\n'.length - 'qt-test-boundary-0123456789'.length);
      const res = await postRaw(url, owner, `/api/instance-sets/${setId}/files`, cut, contentType, cut.length);
      expect(res.status).toBe(400);
      expect(isErrorShape(res.body)).toBe(true);
    });

    it('answers an empty or cut-off multipart body to the submissions route with 4xx in the error shape', async () => {
      const { body, contentType } = multipart([{ name: 'plan.json', bytes: Buffer.from('{"model":"classic"}') }]);
      for (const sent of [Buffer.alloc(0), body.subarray(0, 40)]) {
        const res = await postRaw(url, owner, '/api/submissions', sent, contentType);
        expect(res.status).toBeGreaterThanOrEqual(400);
        expect(res.status).toBeLessThan(500);
        expect(isErrorShape(res.body)).toBe(true);
      }
    });
  });
});
