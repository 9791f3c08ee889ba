/**
 * The preview server (preview/server.js) without a browser: the panel's HTML gets the Office stand-in
 * instead of Office's CDN script (quoted or minified), dist/ files and the preview's static files are
 * served, and nothing outside them is. Runs against the bridge fixture as its dist/ folder.
 */
import * as http from 'http';
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

describe('preview server', () => {
  it('replaces Office’s CDN script with the stand-in, quoted or minified', () => {
    const stand = '<script src="/preview/office-stand-in.js"></script>';
    expect(server.rewriteTaskpane('<head><script src="https://appsforoffice.microsoft.com/lib/1/hosted/office.js"></script></head>')).toBe(`<head>${stand}</head>`);
    expect(server.rewriteTaskpane('<head><script src=https://appsforoffice.microsoft.com/lib/1/hosted/office.js></script><script defer src=taskpane.js></script></head>')).toBe(
      `<head>${stand}<script defer src=taskpane.js></script></head>`,
    );
    expect(server.rewriteTaskpane('<html><head lang="en"><title>x</title></head></html>')).toBe(`<html><head lang="en">${stand}<title>x</title></head></html>`);
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
