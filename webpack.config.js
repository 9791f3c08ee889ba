/**
 * Build of the Excel add-in into dist/:
 *   functions.js    the worksheet functions (functions/functions.ts gathers functions/wrappers/*.ts); needs only the CustomFunctions and
 *                   Office globals, no DOM (checked by test/addin/bundle.test.ts in a bare vm context)
 *   functions.json  their metadata, generated from the JSDoc by custom-functions-metadata-plugin
 *   taskpane.html   the side panel page; in the shared runtime it also loads functions.js
 *   taskpane.js     the side panel (taskpane/index.ts)
 *   help/*.html     one help page per function plus an index (help/build.js, from the same JSDoc); before
 *                   compiling, help/build.js also rewrites functions/texts.generated.json (the side panel's texts)
 *   assets/icon-*.png, manifest.xml
 *
 * ADDIN_BASE_URL (default https://localhost:3000/) is the base URL the add-in is served from; it is
 * written into dist/manifest.xml and into the help URLs of dist/functions.json. `npm run release`
 * (scripts/release.js) builds with it and packages the result.
 * The preview has its own webpack config (preview/webpack.config.js) and never writes here.
 */
'use strict';
const path = require('path');
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const { sources, Compilation } = require('webpack');
const { DEV_BASE_URL, normaliseBaseUrl, productionManifest, rewriteMetadata } = require('./manifest/writeManifest');
const { ICON_SIZES, drawIcon } = require('./manifest/icons');
const { buildHelpPages, wrapperFiles, writeFunctionTexts, TEMPLATE: HELP_TEMPLATE } = require('./help/build');
const { ContentSecurityPolicyPlugin } = require('./manifest/contentSecurityPolicy');

// ADDIN_DIST_DIR builds elsewhere (the release test builds into a temporary folder); default dist/.
const DIST = process.env.ADDIN_DIST_DIR ? path.resolve(process.env.ADDIN_DIST_DIR) : path.join(__dirname, 'dist');
const DEV_PORT = 3000;

/** Emits the manifest, icons and help pages, and moves help URLs in functions.json to the base URL. */
class AddinAssetsPlugin {
  constructor(baseUrl) {
    this.baseUrl = baseUrl;
  }

  apply(compiler) {
    compiler.hooks.beforeCompile.tap('AddinAssetsPlugin', () => writeFunctionTexts());
    compiler.hooks.thisCompilation.tap('AddinAssetsPlugin', (compilation) => {
      for (const file of wrapperFiles()) compilation.fileDependencies.add(file);
      compilation.fileDependencies.add(path.join(__dirname, 'functions', 'catalogue.ts'));
      compilation.fileDependencies.add(HELP_TEMPLATE);
      compilation.fileDependencies.add(path.join(__dirname, 'manifest', 'manifest.xml'));
      compilation.hooks.processAssets.tap(
        { name: 'AddinAssetsPlugin', stage: Compilation.PROCESS_ASSETS_STAGE_ADDITIONAL },
        () => {
          compilation.emitAsset('manifest.xml', new sources.RawSource(productionManifest(this.baseUrl)));
          for (const size of ICON_SIZES)
            compilation.emitAsset(`assets/icon-${size}.png`, new sources.RawSource(drawIcon(size)));
          for (const [name, html] of buildHelpPages())
            compilation.emitAsset(`help/${name}`, new sources.RawSource(html));
        },
      );
      compilation.hooks.processAssets.tap(
        { name: 'AddinAssetsPlugin', stage: Compilation.PROCESS_ASSETS_STAGE_OPTIMIZE_INLINE },
        () => {
          const asset = compilation.getAsset('functions.json');
          if (!asset || this.baseUrl === DEV_BASE_URL) return;
          const json = rewriteMetadata(asset.source.source().toString(), this.baseUrl);
          compilation.updateAsset('functions.json', new sources.RawSource(json));
        },
      );
    });
  }
}

/** HTTPS options for the dev server from office-addin-dev-certs, or a clear message when they are unavailable. */
async function devServerHttps() {
  try {
    const devCerts = require('office-addin-dev-certs');
    const options = await devCerts.getHttpsServerOptions();
    return { type: 'https', options: { ca: options.ca, key: options.key, cert: options.cert } };
  } catch (error) {
    console.warn(
      [
        '',
        'Lift Ledger dev server: the Office development certificates could not be installed or trusted on this machine',
        `(${error && error.message ? error.message : error}).`,
        'The server starts with a self-signed certificate that Excel will refuse to load the add-in from.',
        'To fix it, run:  npx office-addin-dev-certs install   (it may ask for an administrator password),',
        'then restart:    npm run dev-server',
        '',
      ].join('\n'),
    );
    return 'https';
  }
}

module.exports = async (env = {}, argv = {}) => {
  const mode = argv.mode === 'development' ? 'development' : 'production';
  const baseUrl = normaliseBaseUrl(process.env.ADDIN_BASE_URL || DEV_BASE_URL);
  const serving = Boolean(env.WEBPACK_SERVE);
  return {
    mode,
    context: __dirname,
    devtool: mode === 'development' ? 'source-map' : false,
    entry: {
      functions: './functions/functions.ts',
      taskpane: './taskpane/index.ts',
    },
    // 'web' with globalThis: the functions bundle touches no DOM and runs in Excel's JavaScript-only
    // custom-functions runtime, in the shared runtime's page, and in a bare vm context.
    target: ['web', 'es2020'],
    output: { path: DIST, filename: '[name].js', clean: true, globalObject: 'globalThis', publicPath: '' },
    resolve: { extensions: ['.ts', '.js'] },
    module: {
      rules: [
        {
          test: /\.ts$/,
          exclude: /node_modules/,
          use: {
            loader: 'ts-loader',
            options: {
              transpileOnly: true,
              configFile: path.join(__dirname, 'tsconfig.json'),
              compilerOptions: { module: 'es2020', sourceMap: mode === 'development' },
            },
          },
        },
      ],
    },
    optimization: { splitChunks: false, runtimeChunk: false },
    performance: { hints: false },
    plugins: [
      // one metadata file from all wrapper files; the plugin appends the associate calls to each of them
      new CustomFunctionsMetadataPlugin({ output: 'functions.json', input: wrapperFiles() }),
      new HtmlWebpackPlugin({
        filename: 'taskpane.html',
        template: './taskpane/taskpane.html',
        // shared runtime: the side panel's page is also the custom functions' page
        chunks: ['functions', 'taskpane'],
        chunksSortMode: 'manual',
        scriptLoading: 'defer',
      }),
      new AddinAssetsPlugin(baseUrl),
      // the hashes of the pages' own inline styles into their Content-Security-Policy (and, for the
      // development server only, its live-reload socket)
      new ContentSecurityPolicyPlugin(serving ? { 'connect-src': ["'self'"] } : {}),
    ],
    devServer: serving
      ? {
          port: DEV_PORT,
          hot: false,
          headers: { 'Access-Control-Allow-Origin': '*' },
          server: await devServerHttps(),
          static: false,
        }
      : undefined,
  };
};
