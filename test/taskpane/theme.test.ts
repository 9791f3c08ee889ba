/**
 * The panel's look follows Office's theme: Office.context.officeTheme's isDarkTheme flag where the host
 * gives it, else the body colours (relative luminance as defined in WCAG 2.x, the formula from the
 * specification; white is 1, black 0).
 */
import { luminance, officeThemeMode } from '../../taskpane/logic/theme';

describe('officeThemeMode', () => {
  test('the isDarkTheme flag decides where present', () => {
    expect(officeThemeMode({ isDarkTheme: true, bodyBackgroundColor: '#ffffff' })).toBe('dark');
    expect(officeThemeMode({ isDarkTheme: false, bodyBackgroundColor: '#000000' })).toBe('light');
  });

  test('else the body colours: a background darker than its text is dark', () => {
    expect(officeThemeMode({ bodyBackgroundColor: '#262626', bodyForegroundColor: '#FFFFFF' })).toBe('dark');
    expect(officeThemeMode({ bodyBackgroundColor: '#FFFFFF', bodyForegroundColor: '#262626' })).toBe('light');
    expect(officeThemeMode({ bodyBackgroundColor: '#202020' })).toBe('dark');
  });

  test('nothing usable: follow the system', () => {
    expect(officeThemeMode(undefined)).toBeNull();
    expect(officeThemeMode(null)).toBeNull();
    expect(officeThemeMode({ bodyBackgroundColor: 'dark' })).toBeNull();
  });
});

describe('luminance (WCAG 2.x relative luminance)', () => {
  test('white, black and mid grey', () => {
    expect(luminance('#ffffff')).toBe(1);
    expect(luminance('#000000')).toBe(0);
    // sRGB 0x80 = 128: ((128/255 + 0.055)/1.055)^2.4 = 0.2158605 (the WCAG formula worked by hand)
    expect(luminance('#808080')).toBeCloseTo(0.2158605, 6);
    expect(luminance('red')).toBeNull();
  });
});
