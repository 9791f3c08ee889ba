/**
 * Which look the panel takes: Office's theme when Office gives one (Office.context.officeTheme, so a dark
 * Office shows a dark panel even on a light operating system), else the system's light or dark setting.
 * Pure functions.
 */

/** The parts of Office.OfficeTheme the panel reads (all optional: older hosts give fewer). */
export interface OfficeThemeLike {
  readonly isDarkTheme?: unknown;
  readonly bodyBackgroundColor?: unknown;
  readonly bodyForegroundColor?: unknown;
}

/**
 * Relative luminance of a "#RRGGBB" colour (WCAG 2.x definition), or null for anything else. Cost O(1).
 * @example luminance('#ffffff') //=> 1; luminance('#000000') //=> 0
 */
export function luminance(colour: unknown): number | null {
  if (typeof colour !== 'string') return null;
  const match = /^#?([0-9a-f]{6})$/i.exec(colour.trim());
  if (match?.[1] === undefined) return null;
  const n = Number.parseInt(match[1], 16);
  const channel = (v: number): number => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * channel((n >> 16) & 255) + 0.7152 * channel((n >> 8) & 255) + 0.0722 * channel(n & 255);
}

/**
 * 'dark' or 'light' from Office's theme: its isDarkTheme flag when it has one, else whether the body
 * background is darker than its text; null when Office says nothing usable (follow the system then).
 * Cost O(1).
 * @example officeThemeMode({ isDarkTheme: true }) //=> 'dark'; officeThemeMode({ bodyBackgroundColor: '#262626', bodyForegroundColor: '#ffffff' }) //=> 'dark'
 */
export function officeThemeMode(theme: OfficeThemeLike | null | undefined): 'dark' | 'light' | null {
  if (theme === null || theme === undefined) return null;
  if (typeof theme.isDarkTheme === 'boolean') return theme.isDarkTheme ? 'dark' : 'light';
  const background = luminance(theme.bodyBackgroundColor);
  if (background === null) return null;
  const text = luminance(theme.bodyForegroundColor);
  if (text !== null) return background < text ? 'dark' : 'light';
  return background < 0.5 ? 'dark' : 'light';
}
