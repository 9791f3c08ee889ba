#!/usr/bin/env node
/**
 * `npm start`: the Lift Ledger preview workbook in a browser, no Excel needed.
 * Builds what is missing or stale (the add-in's dist/ and the preview bundle), serves plain http on
 * localhost (port 3100 or the first free one after it; PORT=… to choose), prints the URL and opens a
 * browser where one is available. Set NO_OPEN=1 (or pass --no-open) to skip opening a browser.
 */
'use strict';
const { spawn } = require('child_process');
const { startPreviewServer, ensureAddinBuilt, ensurePreviewBuilt } = require('./server');

function openBrowser(url) {
  if (process.env.NO_OPEN || process.argv.includes('--no-open') || process.env.CI) return;
  const command = process.platform === 'darwin' ? 'open' : process.platform === 'win32' ? 'cmd' : 'xdg-open';
  const args = process.platform === 'win32' ? ['/c', 'start', '""', url] : [url];
  if (process.platform === 'linux' && !process.env.DISPLAY && !process.env.WAYLAND_DISPLAY) return;
  try {
    const child = spawn(command, args, { stdio: 'ignore', detached: true });
    child.on('error', () => console.log(`(No browser could be opened; open ${url} yourself.)`));
    child.unref();
  } catch {
    console.log(`(No browser could be opened; open ${url} yourself.)`);
  }
}

async function main() {
  try {
    ensureAddinBuilt();
  } catch (error) {
    console.error(
      `The add-in build failed: ${error.message}. The preview will start, but its functions may be missing.`,
    );
  }
  ensurePreviewBuilt();
  const requested = process.env.PORT !== undefined ? Number(process.env.PORT) : 3100;
  if (!Number.isInteger(requested) || requested < 0 || requested > 65535)
    throw new Error(`PORT must be a port number, got ${process.env.PORT}`);
  const server = await startPreviewServer({ port: requested });
  console.log(`Lift Ledger preview (invented demo data): ${server.url}`);
  console.log('Press Ctrl+C to stop');
  openBrowser(server.url);
  const stop = () => {
    server.close().then(() => process.exit(0));
    setTimeout(() => process.exit(0), 1000).unref();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((error) => {
  console.error(`The preview could not start: ${error.message}`);
  process.exit(1);
});
