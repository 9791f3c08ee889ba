/*
 * Lift Ledger preview: replaces Office's office.js inside the side-panel iframe. The panel is served by the
 * preview server with this script in place of the CDN script, and gets Office/Excel globals that work on the
 * preview's workbook in the parent page (same origin). See preview/src/excelStandIn.ts.
 */
(function () {
  var parentPreview;
  try {
    parentPreview = window.parent && window.parent !== window ? window.parent.liftLedgerPreview : null;
  } catch (e) {
    parentPreview = null;
  }
  if (!parentPreview) {
    document.addEventListener('DOMContentLoaded', function () {
      var note = document.createElement('p');
      note.textContent = 'This side panel runs inside Excel or inside the Lift Ledger preview page (npm start).';
      document.body.prepend(note);
    });
    return;
  }
  var api = parentPreview.createOfficeForFrame(window);
  window.Office = api.Office;
  window.Excel = api.Excel;
  window.CustomFunctions = api.CustomFunctions;
})();
