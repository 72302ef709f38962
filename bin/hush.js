#!/usr/bin/env node
'use strict';
const path = require('path');
const fs = require('fs');
const entry = path.join(__dirname, '..', 'dist', 'node', 'cli', 'index.js');
if (!fs.existsSync(entry)) {
  process.stderr.write("hush: not built yet; run 'npm run build' first\n");
  process.exit(2);
}
require(entry);
