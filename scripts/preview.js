#!/usr/bin/env node
// Serves dist/web on http://localhost (loopback only) for the task pane preview
// outside Excel: open http://localhost:PORT/taskpane.html?preview (the address
// is printed). `npm run preview` builds first. Options: --port N (default 3100,
// 0 = any free port), --dir PATH (default dist/web).
'use strict';
const http = require('http');
const fs = require('fs');
const path = require('path');

const TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.png': 'image/png',
  '.xml': 'application/xml; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
};

/** Starts the server; resolves with { server, url } once listening. */
function serve(dir, port = 3100, host = '127.0.0.1') {
  const root = path.resolve(dir);
  const server = http.createServer((req, res) => {
    // A path that does not decode, or that holds a control character (a null
    // byte makes fs throw), is answered 400; the server keeps running.
    let rel;
    try {
      rel = decodeURIComponent(new URL(req.url, 'http://localhost').pathname);
    } catch {
      rel = null;
    }
    if (rel === null || /[\u0000-\u001f\u007f]/.test(rel)) {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' }).end('bad request: malformed path');
      return;
    }
    if (rel.endsWith('/')) rel += 'taskpane.html';
    const file = path.resolve(root, '.' + rel);
    if (file !== root && !file.startsWith(root + path.sep)) {
      res.writeHead(403).end('forbidden');
      return;
    }
    try {
      fs.readFile(file, (err, body) => {
        if (err) {
          res.writeHead(404, { 'Content-Type': 'text/plain; charset=utf-8' }).end(`not found: ${encodeURI(rel)}`);
          return;
        }
        res.writeHead(200, { 'Content-Type': TYPES[path.extname(file)] || 'application/octet-stream', 'Cache-Control': 'no-store' });
        res.end(body);
      });
    } catch {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' }).end('bad request: malformed path');
    }
  });
  // A malformed request line is answered 400 by Node and never reaches the handler; a socket error never stops the server.
  server.on('clientError', (err, socket) => {
    if (socket.writable) socket.end('HTTP/1.1 400 Bad Request\r\nConnection: close\r\n\r\n');
    else socket.destroy();
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      const p = server.address().port;
      resolve({ server, url: `http://localhost:${p}/taskpane.html?preview` });
    });
  });
}

module.exports = { serve };

if (require.main === module) {
  const args = process.argv.slice(2);
  const opt = (name, dflt) => {
    const i = args.indexOf(name);
    return i >= 0 && args[i + 1] !== undefined ? args[i + 1] : dflt;
  };
  const dir = opt('--dir', path.join(__dirname, '..', 'dist', 'web'));
  const port = Number(opt('--port', '3100'));
  if (!fs.existsSync(path.join(dir, 'taskpane.html'))) {
    console.error(`no ${path.join(dir, 'taskpane.html')}: build first (npm run build:web)`);
    process.exit(1);
  }
  serve(dir, port).then(
    ({ url }) => console.log(`task pane preview (demo project, no Excel): ${url}\nCtrl+C stops the server.`),
    (e) => {
      console.error(`could not serve on port ${port}: ${e.message}`);
      process.exit(1);
    },
  );
}
