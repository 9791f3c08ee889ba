/**
 * The preview server (preview/server.js) without a browser: the panel's HTML gets the Office stand-in
 * instead of Office's CDN script (quoted or minified), dist/ files and the preview's static files are
 * served, and nothing outside them is. Hostile and malformed requests (null bytes, bad percent-encodings,
 * traversal however encoded, backslashes, overlong URLs, other methods) are answered with 4xx and the
 * server goes on serving. Runs against the bridge fixture as its dist/ folder.
 */
import * as http from 'http';
import * as net from 'net';
import * as path from 'path';

process.env.PREVIEW_DIST = path.join(__dirname, 'fixtures');
// eslint-disable-next-line @typescript-eslint/no-require-imports
const server = require('../../preview/server.js') as {
  rewriteTaskpane(html: string): string;
  startPreviewServer(options: { port: number }): Promise<{ url: string; port: number; close(): Promise<void> }>;
  findFreePort(port: number): Promise<number>;
};

function get(url: string): Promise<{ status: number; type: string; body: string }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (body += chunk));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, type: String(res.headers['content-type']), body }));
      })
      .on('error', reject);
  });
}

/**
 * Sends one request exactly as written (no client-side checks or normalisation of the path) and resolves
 * with the status code and headers of the answer.
 */
function raw(port: number, method: string, target: string): Promise<{ status: number; head: string; body: string }> {
  return new Promise((resolve, reject) => {
    const socket = net.connect(port, 'localhost', () => {
      socket.write(`${method} ${target} HTTP/1.1\r\nHost: localhost\r\nConnection: close\r\n\r\n`, 'latin1');
    });
    let text = '';
    socket.setEncoding('latin1');
    socket.on('data', (chunk: string) => (text += chunk));
    socket.on('error', reject);
    socket.on('close', () => {
      const [head = '', body = ''] = text.split('\r\n\r\n');
      resolve({ status: Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0), head, body });
    });
  });
}

describe('preview server', () => {
  it('replaces Office’s CDN script with the stand-in, quoted or minified', () => {
    const stand = '<script src="/preview/office-stand-in.js"></script>';
    expect(
      server.rewriteTaskpane(
        '<head><script src="https://appsforoffice.microsoft.com/lib/1/hosted/office.js"></script></head>',
      ),
    ).toBe(`<head>${stand}</head>`);
    expect(
      server.rewriteTaskpane(
        '<head><script src=https://appsforoffice.microsoft.com/lib/1/hosted/office.js></script><script defer src=taskpane.js></script></head>',
      ),
    ).toBe(`<head>${stand}<script defer src=taskpane.js></script></head>`);
    expect(server.rewriteTaskpane('<html><head lang="en"><title>x</title></head></html>')).toBe(
      `<html><head lang="en">${stand}<title>x</title></head></html>`,
    );
  });

  it('serves dist files and the preview’s static files, and nothing outside them', async () => {
    const running = await server.startPreviewServer({ port: 0 });
    try {
      expect(running.url).toBe(`http://localhost:${running.port}/`);
      const json = await get(`${running.url}functions.json`);
      expect(json.status).toBe(200);
      expect(json.type).toMatch(/application\/json/);
      expect(JSON.parse(json.body).functions.length).toBe(3);
      const css = await get(`${running.url}preview/preview.css`);
      expect(css.status).toBe(200);
      expect(css.type).toMatch(/text\/css/);
      const standIn = await get(`${running.url}preview/office-stand-in.js`);
      expect(standIn.body).toContain('createOfficeForFrame');
      // the fixture folder has no taskpane.html: a page saying how to build it
      const panel = await get(`${running.url}taskpane.html`);
      expect(panel.body).toContain('npm run build');
      expect((await get(`${running.url}..%2F..%2Fpackage.json`)).status).toBe(404);
      expect((await get(`${running.url}preview/..%2F..%2Fpackage.json`)).status).toBe(404);
    } finally {
      await running.close();
    }
  });

  it('answers hostile and malformed requests with 4xx and keeps serving after each', async () => {
    const running = await server.startPreviewServer({ port: 0 });
    try {
      const cases: [method: string, target: string, status: number][] = [
        // null bytes and other control characters, however they are spelled (GET /%00 used to stop the server)
        ['GET', '/%00', 400],
        ['GET', '/preview/%00', 400],
        ['GET', '/help/%00.html', 400],
        ['GET', '/functions.json%00.png', 400],
        ['GET', '/%0a', 400],
        ['GET', '/%7F', 400],
        ['GET', 'http://localhost/%00', 400],
        // bad percent-encodings
        ['GET', '/%zz', 400],
        ['GET', '/%E0%A4%A', 400],
        ['GET', '/%', 400],
        // climbing out of the served folders: literal and %2e%2e dot segments are resolved at the root by
        // the URL parser (so /package.json is looked up in dist/ and not found); encoded slashes survive it
        ['GET', '/../package.json', 404],
        ['GET', '/%2e%2e/%2e%2e/package.json', 404],
        ['GET', '/..%2F..%2Fpackage.json', 404],
        ['GET', '/preview/..%2F..%2F..%2Fpackage.json', 404],
        ['GET', '/%2E%2E%2f%2E%2E%2fpackage.json', 404],
        ['GET', '/%252e%252e/package.json', 404],
        // backslashes: a raw one is a separator to the URL parser, an encoded one is refused
        ['GET', '/..\\..\\package.json', 404],
        ['GET', '/..%5C..%5Cpackage.json', 400],
        ['GET', '/preview/..%5c..%5cserver.js', 400],
        // a folder is not a file
        ['GET', '/preview/', 404],
        // overlong URLs: 414 above the server's 2048 characters, Node's own 431 beyond its 16 KB header limit
        ['GET', `/${'a'.repeat(3000)}`, 414],
        ['GET', `/${'a'.repeat(20000)}`, 431],
        // other methods
        ['POST', '/functions.json', 405],
        ['PUT', '/functions.json', 405],
        ['DELETE', '/functions.json', 405],
        ['OPTIONS', '*', 405],
        ['TRACE', '/', 405],
      ];
      const answers: string[] = [];
      for (const [method, target, status] of cases) {
        const answer = await raw(running.port, method, target);
        const request = `${method} ${target.slice(0, 40)}`;
        answers.push(`${request} → ${answer.status}`);
        expect(`${request} → ${answer.status}`).toBe(`${request} → ${status}`);
        if (status === 405) expect(answer.head).toMatch(/\r\nAllow: GET, HEAD/i);
        const good = await get(`${running.url}functions.json`);
        expect(good.status).toBe(200);
        expect(JSON.parse(good.body).functions.length).toBe(3);
      }
      expect(answers).toHaveLength(cases.length);
      // HEAD answers like GET, without a body
      const head = await raw(running.port, 'HEAD', '/functions.json');
      expect(head.status).toBe(200);
      expect(head.body).toBe('');
    } finally {
      await running.close();
    }
  }, 60_000);

  it('moves on to the next port when the asked one is taken', async () => {
    const running = await server.startPreviewServer({ port: 0 });
    try {
      const next = await server.findFreePort(running.port);
      expect(next).toBeGreaterThan(running.port);
    } finally {
      await running.close();
    }
  });
});
