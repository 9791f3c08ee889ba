/**
 * Webpack build of the preview page only (HyperFormula, the grid, the CustomFunctions and Office/Excel
 * stand-ins) into preview/build/. It never touches dist/: HyperFormula (GPL-v3 licence key) must stay out
 * of the add-in bundles, which the root webpack.config.js builds.
 */
const path = require('path');
const HtmlWebpackPlugin = require('html-webpack-plugin');

module.exports = (env, argv) => ({
  mode: argv && argv.mode ? argv.mode : 'development',
  context: __dirname,
  entry: { preview: './src/main.ts' },
  target: 'web',
  devtool: 'source-map',
  output: { path: path.join(__dirname, 'build'), filename: '[name].js', publicPath: '/preview/', clean: true },
  resolve: { extensions: ['.ts', '.js'] },
  module: {
    rules: [
      {
        test: /\.ts$/,
        exclude: /node_modules/,
        use: {
          loader: 'ts-loader',
          options: { transpileOnly: true, configFile: path.join(__dirname, '..', 'tsconfig.json') },
        },
      },
    ],
  },
  performance: { hints: false },
  plugins: [
    new HtmlWebpackPlugin({
      template: './src/index.html',
      filename: 'index.html',
      inject: 'body',
      scriptLoading: 'defer',
    }),
  ],
});
