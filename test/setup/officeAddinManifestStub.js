// office-addin-mock imports office-addin-manifest, which pulls an ESM-only module jest cannot load on
// node 20. The mock never uses it for our tests, so jest maps the module to this empty stand-in.
module.exports = {};
