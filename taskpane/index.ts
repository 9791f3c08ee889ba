// Placeholder entry of the side panel; the side-panel work replaces this file.
export {};
