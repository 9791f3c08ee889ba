// office-addin-mock imports office-addin-manifest, which pulls an ESM-only module jest cannot load on
// node 20. The mock only reads the OfficeApp enum from it (to tell Outlook mocks apart), so jest maps the
// module to this stand-in with the enum's values as office-addin-manifest 3 defines them.
module.exports = {
  OfficeApp: {
    Excel: 'excel',
    OneNote: 'onenote',
    Outlook: 'outlook',
    PowerPoint: 'powerpoint',
    Project: 'project',
    Word: 'word',
  },
};
