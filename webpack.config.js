/* Builds the Excel add-in into dist/web (shared runtime: one page, taskpane.html,
 * loads both the task pane and the worksheet functions).
 *
 *   npm run build:web            production bundle
 *   npm run dev-server           https://localhost:3000 with office-addin-dev-certs
 *   npm run dev-server:http      http://localhost:3000, no certificates (tests, previews)
 *
 * Options (webpack --env NAME=VALUE):
 *   http           serve over plain http (no certificates needed; Office itself requires https)
 *   port=N         dev-server port (default: npm config dev_server_port, else 3000)
 *   publicUrl=URL  where dist/web will be hosted; replaces https://localhost:3000/ in the copied manifest
 *                  and in the help links (helpUrl) of functions.json
 *
 * Besides the two entries, webpack bundles two Web Workers from their
 * `new Worker(new URL(…), …)` expressions, each a self-contained script with
 * its own runtime: the task pane's verification (taskpane/verify.worker.ts)
 * and the heavy worksheet functions' worker (src/functions/worker.ts, named
 * functions-worker.js). HelpPagesPlugin writes the functions' help pages
 * (scripts/help-pages.ts) into help/.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');
const HtmlWebpackPlugin = require('html-webpack-plugin');

const DEV_URL = 'https://localhost:3000/';
const OUTPUT = path.resolve(__dirname, 'dist/web');
const FUNCTIONS = path.resolve(__dirname, 'src/functions/functions.ts');

/**
 * One help page per worksheet function (help/<ID>.html, help/index.html,
 * help/help.css), generated from the JSDoc of src/functions/functions.ts by
 * scripts/help-pages.ts (TypeScript, loaded through tsx); and functions.json,
 * once custom-functions-metadata-plugin has emitted it, with each description
 * cut to its one sentence (the examples are on the help page) and each
 * helpUrl on the public URL.
 */
class HelpPagesPlugin {
  constructor(options) {
    this.options = options;
  }

  apply(compiler) {
    const { Compilation, sources } = compiler.webpack;
    compiler.hooks.thisCompilation.tap('HushHelpPages', (compilation) => {
      compilation.hooks.processAssets.tap({ name: 'HushHelpPages', stage: Compilation.PROCESS_ASSETS_STAGE_ADDITIONAL }, () => {
        // tsx loads the TypeScript generator (and scripts/lib/examples.ts) on demand.
        const help = require('tsx/cjs/api').require(path.join(__dirname, 'scripts/help-pages.ts'), path.join(__dirname, 'webpack.config.js'));
        const source = fs.readFileSync(FUNCTIONS, 'utf8');
        compilation.fileDependencies.add(FUNCTIONS);
        for (const [name, text] of help.helpFiles(source, this.options.version)) {
          compilation.emitAsset(`${help.HELP_DIR}/${name}`, new sources.RawSource(text));
        }
        const meta = compilation.getAsset('functions.json');
        if (meta) {
          const json = help.excelMetadata(meta.source.source().toString(), source, this.options.publicUrl);
          compilation.updateAsset('functions.json', new sources.RawSource(json));
        }
      });
    });
  }
}

/** HTTPS options from the Office dev certificates, or null (with the reason) when they cannot be had. */
async function devCertificates() {
  try {
    const devCerts = require('office-addin-dev-certs');
    const options = await devCerts.getHttpsServerOptions();
    return { options: { ca: options.ca, key: options.key, cert: options.cert } };
  } catch (e) {
    return { reason: e && e.message ? e.message : String(e) };
  }
}

module.exports = async (env = {}, argv = {}) => {
  const dev = argv.mode === 'development';
  const serving = Boolean(env.WEBPACK_SERVE);
  const port = Number(env.port || process.env.npm_package_config_dev_server_port || 3000);
  const publicUrl = env.publicUrl ? String(env.publicUrl).replace(/\/?$/, '/') : DEV_URL;

  let server = 'http';
  let serverOptions;
  if (serving && !env.http) {
    const certs = await devCertificates();
    if (certs.options) {
      server = 'https';
      serverOptions = certs.options;
    } else {
      console.warn(`[hush] no development certificates (${certs.reason}); serving over http. Excel needs https: run "npx office-addin-dev-certs install" and retry.`);
    }
  }

  return {
    // No eval-based source maps: taskpane.html's Content-Security-Policy forbids eval.
    devtool: 'source-map',
    entry: {
      taskpane: './taskpane/taskpane.ts',
      functions: './src/functions/functions.ts',
    },
    output: {
      path: OUTPUT,
      filename: '[name].js',
      clean: true,
    },
    resolve: {
      extensions: ['.ts', '.js'],
      // src/plan/units.ts builds its unit engine from four of mathjs's ES modules, read by path
      // (mathjs's package exports offer only its whole entry); this is where that path points.
      alias: { 'mathjs/lib/esm': path.join(path.dirname(require.resolve('mathjs')), '..', 'esm') },
    },
    module: {
      rules: [
        {
          // Listed before ts-loader, so it runs after it, on the plugin's appended associate calls (see the loader).
          test: FUNCTIONS,
          use: path.resolve(__dirname, 'scripts/guard-associate-loader.js'),
        },
        {
          test: /\.ts$/,
          exclude: /node_modules/,
          use: {
            loader: 'ts-loader',
            options: {
              transpileOnly: true,
              // tsconfig.json is set up for type checking (noEmit) and CommonJS for Node;
              // the browser bundle wants emitted ES modules so webpack can drop unused code.
              compilerOptions: { noEmit: false, module: 'es2020', target: 'es2020', sourceMap: true },
            },
          },
        },
      ],
    },
    plugins: [
      new CustomFunctionsMetadataPlugin({
        output: 'functions.json',
        input: './src/functions/functions.ts',
      }),
      new HelpPagesPlugin({ publicUrl, version: `Hush ${require('./package.json').version}` }),
      new HtmlWebpackPlugin({
        filename: 'taskpane.html',
        template: './taskpane/taskpane.html',
        // Shared runtime: the one page runs the task pane and registers the functions.
        chunks: ['taskpane', 'functions'],
        chunksSortMode: 'manual',
      }),
      new CopyWebpackPlugin({
        patterns: [
          { from: 'assets/icon-*.png', to: 'assets/[name][ext]' },
          { from: 'taskpane/taskpane.css', to: 'taskpane.css' },
          {
            from: 'manifest.xml',
            to: 'manifest.xml',
            transform(content) {
              return publicUrl === DEV_URL ? content : content.toString().split(DEV_URL).join(publicUrl);
            },
          },
        ],
      }),
    ],
    optimization: {
      // One page runs both entries (shared runtime): the code both carry (the plan API, the physics core,
      // the unit engine) goes once into shared.js, and one webpack runtime serves both, so each module
      // runs once and the pane and the worksheet functions share its state (e.g. the design cache).
      runtimeChunk: { name: 'shared' },
      splitChunks: {
        cacheGroups: {
          default: false,
          defaultVendors: false,
          shared: { name: 'shared', chunks: 'initial', minChunks: 2, enforce: true },
        },
      },
    },
    performance: { hints: false },
    devServer: {
      port,
      server: serverOptions ? { type: server, options: serverOptions } : server,
      headers: { 'Access-Control-Allow-Origin': '*' },
      static: false,
      hot: false,
      client: dev ? { overlay: false } : false,
    },
  };
};
