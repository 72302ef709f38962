// webpack loader for src/functions/functions.ts, run after custom-functions-metadata-plugin's own loader
// has appended its `CustomFunctions.associate("ID", fn);` lines: each call is guarded, so that the page
// outside Excel (the preview, scripts/preview.js), where Office's CustomFunctions runtime is absent,
// loads the functions chunk without "ReferenceError: CustomFunctions is not defined". In Excel nothing
// changes: the runtime defines CustomFunctions before the chunk runs.
'use strict';

module.exports = function guardAssociate(source) {
  return source.replace(/^CustomFunctions\.associate\(/gm, 'if (typeof CustomFunctions !== "undefined") CustomFunctions.associate(');
};
