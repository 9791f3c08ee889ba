/*
 * Lift Ledger preview: replaces Office's office.js inside the side-panel iframe. The panel is served by the
 * preview server with this script in place of the CDN script, and gets Office/Excel globals that work on the
 * preview's workbook in the parent page (same origin). See preview/src/excelStandIn.ts.
 *
 * It also stands in for the parts of Office.context the panel reads: `officeTheme` (light or dark) and
 * `displayLanguage`. Both come from the preview page's address (`?theme=dark`, `?lang=de-DE`); a switch in
 * the preview's banner flips the theme and reloads the panel, as Office shows a panel after a theme change.
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

  // The preview's own two looks (invented colours in the spirit of Office's light and dark themes).
  var THEMES = {
    light: {
      isDarkTheme: false,
      bodyBackgroundColor: '#FFFFFF',
      bodyForegroundColor: '#262626',
      controlBackgroundColor: '#F3F3F3',
      controlForegroundColor: '#262626',
    },
    dark: {
      isDarkTheme: true,
      bodyBackgroundColor: '#262626',
      bodyForegroundColor: '#F3F3F3',
      controlBackgroundColor: '#333333',
      controlForegroundColor: '#F3F3F3',
    },
  };
  var pageUrl = new URL(window.parent.location.href);
  var themeName = pageUrl.searchParams.get('theme') === 'dark' ? 'dark' : 'light';
  var language = pageUrl.searchParams.get('lang') || 'en-US';

  var api = parentPreview.createOfficeForFrame(window);
  var office = api.Office;
  office.context = Object.assign({}, office.context || {}, {
    officeTheme: Object.assign({}, THEMES[themeName]),
    displayLanguage: language,
    contentLanguage: language,
  });
  window.Office = office;
  window.Excel = api.Excel;
  window.CustomFunctions = api.CustomFunctions;

  // The theme switch in the preview's banner, made afresh by each load of the panel (its handler belongs
  // to the panel that is showing).
  var page = window.parent.document;
  var toggle = page.getElementById('toggle-panel');
  var old = page.getElementById('office-theme-switch');
  if (old) old.remove();
  if (toggle) {
    var button = page.createElement('button');
    button.id = 'office-theme-switch';
    button.type = 'button';
    button.setAttribute('aria-pressed', String(themeName === 'dark'));
    button.textContent = 'Office theme: ' + themeName;
    button.title = 'Show the side panel as in Office with a light or dark theme';
    button.style.marginRight = '8px';
    button.addEventListener('click', function () {
      var url = new URL(window.parent.location.href);
      url.searchParams.set('theme', themeName === 'dark' ? 'light' : 'dark');
      window.parent.history.replaceState(null, '', url.toString());
      button.disabled = true;
      window.location.reload();
    });
    toggle.parentNode.insertBefore(button, toggle);
  }
})();
